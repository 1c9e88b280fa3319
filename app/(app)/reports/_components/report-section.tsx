import type { ReactNode } from "react";
import { buttonClasses } from "@/app/_components/button-classes";
import { Card } from "@/app/_components/card";

// A section of the report: its chart, the table with the same figures (what a screen reader reads,
// and what the eye checks), and the CSV of that table.

export function ReportSection({
  title,
  description,
  csvHref,
  chart,
  children,
}: {
  title: string;
  description: ReactNode;
  csvHref: string;
  chart?: ReactNode;
  children: ReactNode;
}) {
  return (
    <Card
      title={title}
      description={description}
      actions={
        <a href={csvHref} className={buttonClasses({ variant: "secondary", size: "sm" })} download>
          CSV<span className="sr-only"> of {title.toLowerCase()}</span>
        </a>
      }
    >
      {chart && <div className="mb-4">{chart}</div>}
      {children}
    </Card>
  );
}
