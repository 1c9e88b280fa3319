import type { Metadata } from "next";
import { z } from "zod";
import { Card } from "@/app/_components/card";
import { PageHeader } from "@/app/_components/page-header";
import { TrainingRecordsTable } from "@/app/_components/training/records-table";
import { can, requirePageUser } from "@/lib/auth/guards";
import { institutionToday } from "@/lib/permits/queries";
import { listCourseTypes, recordsOf, trainablePeople } from "@/lib/training/queries";
import { RecordTrainingForm } from "./record-training-form";

export const metadata: Metadata = { title: "Training" };

// Safety officers and admins record the courses people completed and read anyone's record.
export default async function TrainingPage({
  searchParams,
}: {
  searchParams: Promise<{ person?: string | string[] }>;
}) {
  const user = await requirePageUser("training.record", "/training");
  const { person } = await searchParams;
  const [people, courses, today] = await Promise.all([trainablePeople(), listCourseTypes(), institutionToday()]);
  const parsed = z.uuid().safeParse(person);
  const selected = parsed.success ? people.find((p) => p.id === parsed.data) : undefined;
  const records = selected ? await recordsOf(user, selected.id, today) : [];
  return (
    <>
      <PageHeader
        title="Training"
        description="Courses people completed. A named operator needs each course their permit's tier requires, current through the permit's last day."
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="flex min-w-0 flex-col gap-6">
          <Card title="Whose record">
            <form method="get" className="flex flex-wrap items-end gap-3">
              <label className="flex flex-col text-sm font-medium text-stone-800">
                Person
                <select
                  name="person"
                  defaultValue={selected?.id ?? ""}
                  className="mt-1 rounded-md border border-stone-300 bg-white px-3 py-2 text-[0.9375rem]"
                >
                  <option value="">Choose a person</option>
                  {people.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name} ({p.email})
                    </option>
                  ))}
                </select>
              </label>
              <button type="submit" className="rounded-md border border-stone-300 px-3 py-2 text-sm font-medium">
                Show
              </button>
            </form>
          </Card>
          {selected && (
            <Card title={`Training of ${selected.name}`} flush>
              <TrainingRecordsTable records={records} caption={`Training of ${selected.name}`} />
            </Card>
          )}
        </div>
        <Card title="Record a course">
          {courses.length === 0 ? (
            <p className="text-sm text-stone-700">
              No course types yet.{" "}
              {can(user, "training.courses") ? (
                <a href="/admin/training" className="underline">
                  Add one
                </a>
              ) : (
                "An admin adds them."
              )}
            </p>
          ) : (
            <RecordTrainingForm
              people={people.map((p) => ({ id: p.id, label: `${p.name} (${p.email})` }))}
              courses={courses.map((c) => ({ id: c.id, label: `${c.name} (${c.validityMonths} months)` }))}
              defaultPerson={selected?.id ?? ""}
              today={today}
            />
          )}
        </Card>
      </div>
    </>
  );
}
