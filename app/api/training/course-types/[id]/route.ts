// PATCH /api/training/course-types/[id] — an admin changes a course type, or retires it
// ({ retired: true }: no longer required nor offered; its records stay) or restores it.
import { route } from "@/lib/http/route";
import { updateCourseType } from "@/lib/training/actions";
import { courseTypeUpdateSchema } from "@/lib/training/schemas";

export const PATCH = route(
  { ids: { id: "That course type" }, access: "training.courses", body: courseTypeUpdateSchema },
  async ({ user, params, body }) => ({ courseType: await updateCourseType(user, params.id, body) }),
);
