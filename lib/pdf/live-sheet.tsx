import { Document, Page, renderToBuffer, Text, View } from "@react-pdf/renderer";
import type { Tier } from "@/lib/hazard";
import { TIER_LABELS } from "@/lib/hazard/rules";
import type { LiveSheet } from "@/lib/permits/live";
import { hazardHeader } from "@/lib/signal-word";
import { TIER_COLOURS } from "@/lib/tier-colours";
import { printDay, printTime } from "./content";
import { registerFonts } from "./fonts";
import { countPages } from "./render";
import { s, TierGlyph } from "./parts";
import { INK } from "./theme";

// The live sheet on one page (A4 landscape): where high voltage is live today, building by building
// in walking order, with the numbers to call, for the fire service's clipboard. The type shrinks until
// the list fits one page; at the smallest size a list that still does not fit is cut, and the sheet
// says how many set-ups are not printed and where to see them all. No database here: the route
// passes the sheet it read (lib/permits/live.ts).

/** Type scales tried, largest first; 1 is 9 pt table text. */
const SCALES = [1, 0.85, 0.72, 0.62, 0.54];

type Column = { label: string; width: string; cell: (r: LiveSheet["rows"][number]) => string };

const COLUMNS: Column[] = [
  { label: "Building", width: "15%", cell: (r) => r.building },
  { label: "Room", width: "15%", cell: (r) => r.room },
  { label: "Tier", width: "13%", cell: (r) => `Tier ${r.tier} · ${TIER_LABELS[r.tier as Tier]}` },
  { label: "Signal word", width: "9%", cell: (r) => hazardHeader(r.tier as Tier)?.word ?? "none" },
  { label: "Set-up · permit", width: "20%", cell: (r) => `${r.apparatusName || r.title} · ${r.number}` },
  { label: "Holder", width: "16%", cell: (r) => `${r.holderName} (${r.departmentName})` },
  { label: "Emergency phone", width: "12%", cell: (r) => r.emergencyPhone ?? "not set" },
];

function LiveSheetDocument({ sheet, scale, limit }: { sheet: LiveSheet; scale: number; limit: number }) {
  const rows = sheet.rows.slice(0, limit);
  const cut = sheet.rows.length - rows.length;
  const body = 9 * scale;
  return (
    <Document
      title={`Live high voltage ${sheet.today}`}
      author={sheet.institutionName ?? "Benchclear"}
      subject="Where high voltage is live today"
      creator="Benchclear"
      producer="Benchclear"
      language="en-GB"
    >
      <Page size="A4" orientation="landscape" style={[s.page, { padding: 24, fontSize: body }]}>
        <View style={{ flexDirection: "row", justifyContent: "space-between", alignItems: "flex-start" }}>
          <View style={{ flex: 1 }}>
            <Text style={s.eyebrow}>{sheet.institutionName ?? "Benchclear"} · Live high voltage now</Text>
            <Text style={{ fontSize: 18, fontWeight: 700, color: INK.text, marginTop: 2 }}>
              {sheet.rows.length} live high-voltage {sheet.rows.length === 1 ? "set-up" : "set-ups"} on{" "}
              {printDay(sheet.today)}
            </Text>
            <Text style={{ fontSize: 8, color: INK.muted, marginTop: 2 }}>
              Read {printTime(sheet.readAt, sheet.timeZone)}. In walking order: building, then room. Treat every listed
              set-up as energised until a qualified person has de-energised and grounded it.
            </Text>
          </View>
          <View style={{ width: 230, marginLeft: 12, padding: 6, borderWidth: 1.5, borderColor: INK.text }}>
            <Text style={{ fontSize: 8, fontWeight: 700, color: INK.text }}>IN AN EMERGENCY CALL</Text>
            {sheet.contacts.length === 0 ? (
              <Text style={{ fontSize: 9 }}>No emergency contacts are set: ask the safety office.</Text>
            ) : (
              sheet.contacts.map((c, i) => (
                <Text key={`${c.label}-${i}`} style={{ fontSize: i === 0 ? 12 : 9, fontWeight: i === 0 ? 700 : 400 }}>
                  {c.label}: {c.phone}
                </Text>
              ))
            )}
          </View>
        </View>

        <View style={{ marginTop: 8, borderTopWidth: 1, borderTopColor: INK.text }}>
          <View style={{ flexDirection: "row", backgroundColor: INK.panel, paddingVertical: 3 * scale }}>
            {COLUMNS.map((c) => (
              <Text key={c.label} style={{ width: c.width, paddingHorizontal: 3, fontWeight: 700, color: INK.text }}>
                {c.label}
              </Text>
            ))}
          </View>
          {rows.length === 0 && (
            <Text style={{ padding: 6, fontSize: 10 }}>No set-up holds an active permit today.</Text>
          )}
          {rows.map((r, i) => {
            const header = hazardHeader(r.tier as Tier);
            const newBuilding = i === 0 || rows[i - 1].building !== r.building;
            return (
              <View
                key={r.permitId}
                wrap={false}
                style={{
                  flexDirection: "row",
                  alignItems: "center",
                  paddingVertical: 2.5 * scale,
                  borderTopWidth: newBuilding ? 1 : 0.5,
                  borderTopColor: newBuilding ? INK.muted : INK.hairline,
                }}
              >
                {COLUMNS.map((c, ci) => {
                  if (ci === 2) {
                    return (
                      <View
                        key={c.label}
                        style={{ width: c.width, paddingHorizontal: 3, flexDirection: "row", alignItems: "center" }}
                      >
                        <TierGlyph tier={r.tier as Tier} size={11 * scale} />
                        <Text style={{ marginLeft: 3, color: TIER_COLOURS[r.tier as Tier].text }}>{c.cell(r)}</Text>
                      </View>
                    );
                  }
                  if (ci === 3 && header) {
                    return (
                      <View key={c.label} style={{ width: c.width, paddingHorizontal: 3 }}>
                        <Text
                          style={{
                            alignSelf: "flex-start",
                            backgroundColor: header.panel,
                            color: header.ink,
                            fontWeight: 700,
                            paddingHorizontal: 3,
                          }}
                        >
                          {header.word}
                        </Text>
                      </View>
                    );
                  }
                  return (
                    <Text
                      key={c.label}
                      style={{
                        width: c.width,
                        paddingHorizontal: 3,
                        fontWeight: ci === 0 && newBuilding ? 700 : 400,
                        color: ci === 0 && !newBuilding ? INK.faint : INK.body,
                      }}
                    >
                      {c.cell(r)}
                    </Text>
                  );
                })}
              </View>
            );
          })}
          {cut > 0 && (
            <Text style={{ marginTop: 4, fontSize: 10, fontWeight: 700, color: "#b91c1c" }}>
              {cut} more live {cut === 1 ? "set-up is" : "set-ups are"} not printed here: open Live now in Benchclear
              for the full list.
            </Text>
          )}
        </View>
        <Text style={{ position: "absolute", bottom: 12, left: 24, right: 24, fontSize: 7, color: INK.faint }}>
          Benchclear advises; local codes, the institution&apos;s rules and a qualified person govern. A set-up listed
          here may be switched off at a given moment; one not listed may not be run.
        </Text>
      </Page>
    </Document>
  );
}

// A first guess of how many rows fit at a scale, so a long list is not rendered at every size (a
// render of 100 rows takes seconds): A4 landscape is 595 pt tall; less the margins (48 pt), the
// header and contacts (~70 pt), the table head (~16 pt) and the footer (~20 pt), about 440 pt hold
// rows of one 9 pt line (line height 1.2) and 5 pt of padding at scale 1. Every guess is checked by
// rendering; a row whose text wraps makes the guess too high, never the output wrong.
const ROWS_PT = 440;
const rowsThatFit = (scale: number) => Math.floor(ROWS_PT / (9 * 1.2 * scale + 5 * scale + 0.5));

/** The sheet as one PDF page: the largest type that fits, else the smallest with the list cut. */
export async function renderLiveSheet(sheet: LiveSheet): Promise<Buffer> {
  registerFonts();
  const all = sheet.rows.length;
  for (const scale of SCALES) {
    if (all > rowsThatFit(scale)) continue;
    const pdf = await renderToBuffer(<LiveSheetDocument sheet={sheet} scale={scale} limit={all} />);
    if (countPages(pdf) === 1) return pdf;
  }
  // Too long even at the smallest type: cut the list (a line says how many are not printed), from the
  // guess down by a tenth until it fits.
  const smallest = SCALES[SCALES.length - 1];
  let limit = Math.min(all, rowsThatFit(smallest));
  for (;;) {
    const pdf = await renderToBuffer(<LiveSheetDocument sheet={sheet} scale={smallest} limit={limit} />);
    if (countPages(pdf) === 1 || limit === 0) return pdf;
    limit = Math.max(0, Math.min(limit - 1, Math.floor(limit * 0.9)));
  }
}
