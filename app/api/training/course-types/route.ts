// GET /api/training/course-types — the course types in force (?all=1 adds retired ones, for admins).
// POST … — an admin defines a course type: name, what it covers, validity in months, the lowest tier
// that requires it, and optionally the one department that requires it.
import { z } from "zod";
import { can } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { createCourseType } from "@/lib/training/actions";
import { listCourseTypes } from "@/lib/training/queries";
import { courseTypeSchema } from "@/lib/training/schemas";

const query = z.object({ all: z.enum(["0", "1"], { error: "Use all=1 or leave it out." }).optional() });

export const GET = route({ access: "user", query }, async ({ user, query }) => ({
  courseTypes: await listCourseTypes({ includeRetired: query.all === "1" && can(user, "training.courses") }),
}));

export const POST = route({ access: "training.courses", body: courseTypeSchema }, async ({ user, body }) => {
  const courseType = await createCourseType(user, body);
  return Response.json({ courseType }, { status: 201 });
});
