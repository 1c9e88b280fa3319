import type { Metadata } from "next";
import { Card } from "@/app/_components/card";
import { formatDateTime } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";
import { describeChain } from "@/lib/rules/chain";
import {
  currentChainRules,
  currentReminderRules,
  currentTierRuleSet,
  listRuleSets,
  type RuleSetHistoryRow,
} from "@/lib/rules/queries";
import { institutionTimeZone } from "@/lib/settings/queries";
import { todayIn } from "@/lib/permits/dates";
import { editableSettings } from "@/lib/settings/queries";
import { ChainRulesForm, PermitPrefixForm, ReminderForm } from "./rules-forms";
import { TierRulesForm } from "./tier-rules-form";
import { EmergencyContactsCard } from "./emergency-contacts-card";

export const metadata: Metadata = { title: "Rules" };

function History({ rows, builtIn, timeZone }: { rows: RuleSetHistoryRow[]; builtIn: string; timeZone: string }) {
  return (
    <ol className="flex flex-col gap-1.5 text-sm">
      {rows.map((r) => (
        <li key={r.id}>
          <span className="font-medium text-stone-900">Version {r.version}</span>
          <span className="text-stone-600">
            {" "}
            · {formatDateTime(r.createdAt, timeZone)} · {r.createdByName ?? "system"}
          </span>
          {r.note && <span className="block text-stone-700">{r.note}</span>}
        </li>
      ))}
      <li>
        <span className="font-medium text-stone-900">Version 0</span>
        <span className="text-stone-600"> · {builtIn}</span>
      </li>
    </ol>
  );
}

export default async function AdminRulesPage() {
  await requirePageUser("admin.rules", "/admin/rules");
  const [chain, tier, reminders, chainHistory, tierHistory, reminderHistory, settings, timeZone] = await Promise.all([
    currentChainRules(),
    currentTierRuleSet(),
    currentReminderRules(),
    listRuleSets("chain"),
    listRuleSets("tier"),
    listRuleSets("reminders"),
    editableSettings(),
    institutionTimeZone(),
  ]);
  const today = todayIn(timeZone);
  const year = Number(today.slice(0, 4));
  return (
    <>
      <PageHeader
        title="Rules"
        description="Who reviews each tier, how long its permits last, the engine's tier thresholds, the reminder schedule and how permits are numbered. Each rule change is a new version; an application keeps the chain rules it was submitted under."
      />
      <div className="flex flex-col gap-6">
        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
          <Card
            title={`Review chain and validity · version ${chain.version}`}
            description="Tiers 2 to 4 always end with a safety officer; a higher tier never gets a shorter chain or a longer validity."
          >
            <ul className="mb-4 flex flex-col gap-1 text-sm text-stone-700">
              {chain.rules.tiers.map((t, i) => (
                <li key={i}>
                  <span className="font-medium text-stone-900">Tier {i}:</span> {describeChain(t)}; up to{" "}
                  {t.validityDays} days
                </li>
              ))}
            </ul>
            <ChainRulesForm rules={chain.rules} />
          </Card>
          <Card title="Chain rules history">
            <History timeZone={timeZone} rows={chainHistory} builtIn="built-in defaults" />
          </Card>
        </div>

        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
          <Card
            title={`Reminder schedule · version ${reminders.version}`}
            description="E-mails to the holder before a permit's last valid day; each is sent once per permit."
          >
            <ReminderForm daysBefore={reminders.rules.daysBefore} />
          </Card>
          <Card title="Reminder history">
            <History timeZone={timeZone} rows={reminderHistory} builtIn="30, 7, 1 and 0 days" />
          </Card>
        </div>

        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
          <Card
            title="Permit numbers"
            description="Permits are numbered PREFIX-YEAR-NNNN, counting from 0001 each year without gaps. A new prefix applies to permits issued from then on; issued permits keep their numbers and the year's count runs on."
          >
            <p className="mb-4 text-sm text-stone-700">
              The next permit issued this year is numbered{" "}
              <span className="figure font-medium text-stone-900">{`${settings.permitPrefix}-${year}-NNNN`}</span>.
            </p>
            <PermitPrefixForm prefix={settings.permitPrefix} year={year} />
          </Card>
        </div>

        <EmergencyContactsCard />

        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
          <Card
            title={`Tier thresholds · ${tier.rules.rulesVersion}`}
            description="The hazard engine's thresholds, one per row, typed as on the application form (4.7 nF, 30 kV). New assessments use the adopted set; stored ones keep theirs. A higher tier's threshold must stay above the lower tier's."
          >
            <TierRulesForm rules={tier.rules} />
          </Card>
          <Card title="Threshold history">
            <History timeZone={timeZone} rows={tierHistory} builtIn="the engine's defaults (benchclear-default-1)" />
          </Card>
        </div>
      </div>
    </>
  );
}
