import type { Metadata } from "next";
import { Card } from "@/app/_components/card";
import { DataTable } from "@/app/_components/data-table";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";
import { listCourseTypes } from "@/lib/training/queries";
import { listDepartments } from "@/lib/users/queries";
import { CourseTypeForm, RetireButton } from "./course-type-form";

export const metadata: Metadata = { title: "Course types" };

// Admins define the courses a named operator must hold, from which tier, and for how long.
export default async function CourseTypesPage() {
  await requirePageUser("training.courses", "/admin/training");
  const [types, departments] = await Promise.all([listCourseTypes({ includeRetired: true }), listDepartments()]);
  return (
    <>
      <PageHeader
        title="Course types"
        description="The training a named operator must hold, current through the permit's last day, from the tier given. The final approval waits for it, or for a signed exception."
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <Card title="Courses" flush>
          <DataTable
            caption="Course types"
            rows={types}
            rowKey={(t) => t.id}
            empty="No course types yet."
            columns={[
              {
                key: "name",
                header: "Course",
                rowHeader: true,
                cell: (t) => (
                  <>
                    <span className={t.retiredAt ? "text-stone-500 line-through" : ""}>{t.name}</span>
                    {t.covers && <p className="text-xs text-stone-600">{t.covers}</p>}
                  </>
                ),
              },
              { key: "validity", header: "Valid for", figure: true, cell: (t) => `${t.validityMonths} months` },
              { key: "tier", header: "Required from", cell: (t) => `tier ${t.minTier}` },
              { key: "where", header: "Where", hideBelow: "md", cell: (t) => t.departmentName ?? "Every department" },
              {
                key: "state",
                header: "",
                cell: (t) => <RetireButton id={t.id} name={t.name} retired={t.retiredAt !== null} />,
              },
            ]}
          />
        </Card>
        <Card title="Add a course type">
          <CourseTypeForm departments={departments.map((d) => ({ id: d.id, name: d.name }))} />
        </Card>
      </div>
    </>
  );
}
