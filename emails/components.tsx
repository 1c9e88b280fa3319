import type { CSSProperties, ReactNode } from "react";
import type { Tier } from "@/lib/hazard/types";
import { ABOUT_FIGURES_TEXT, ABOUT_FIGURES_TITLE, INFO_SYMBOL } from "@/lib/about-figures";
import { TIER_COLOURS } from "@/lib/tier-colours";
import { TIER_GLYPH_VIEWBOX, TIER_GLYPHS } from "@/lib/tier-glyph";

// The building blocks every Benchclear e-mail is made of, and the one frame they sit in. An e-mail is
// described once as content (heading, blocks, the reason the recipient gets it); <EmailDocument>
// renders it to HTML and textBody() to the plain-text part, so the two parts always say the same
// thing and carry the same links. Styles are inline (mail clients drop <style> and classes) and the
// layout is a single centred table, which every client renders.

export type EmailTone = "info" | "success" | "warn" | "danger";

export type EmailBlock =
  | { type: "text"; text: string }
  | { type: "facts"; rows: { label: string; value: string; tier?: Tier }[] }
  | { type: "quote"; label: string; text: string }
  | { type: "list"; label: string; items: string[] }
  | { type: "action"; label: string; url: string }
  | { type: "about-figures" };

export type EmailContent = {
  /** The line mail clients show after the subject; never shown in the body. */
  preheader: string;
  heading: string;
  tone: EmailTone;
  blocks: EmailBlock[];
  /** Why this person receives this e-mail: shown above the footer of every message. */
  reason: string;
};

export type EmailFrame = { institutionName: string; appUrl: string };

// The note about the figures (lib/about-figures.ts), word for word, for mails about permits.
export const EMAIL_ABOUT_FIGURES = `${ABOUT_FIGURES_TITLE}: ${ABOUT_FIGURES_TEXT}`;

const C = {
  page: "#f5f5f4",
  card: "#ffffff",
  border: "#e7e5e4",
  text: "#1c1917",
  muted: "#57534e",
  faint: "#78716c",
  ink: "#283c60",
  inkTint: "#f2f6fb",
};

const TONE: Record<EmailTone, { bar: string; label: string }> = {
  info: { bar: "#3a578e", label: "Notice" },
  success: { bar: "#0f8f84", label: "Done" },
  warn: { bar: "#c47a02", label: "Action needed" },
  danger: { bar: "#b8173a", label: "Important" },
};

const font = "'IBM Plex Sans', 'Helvetica Neue', Helvetica, Arial, sans-serif";
const mono = "'IBM Plex Mono', 'SFMono-Regular', Menlo, Consolas, monospace";

const s = {
  body: { margin: 0, padding: 0, backgroundColor: C.page, fontFamily: font, color: C.text } satisfies CSSProperties,
  outer: { width: "100%", backgroundColor: C.page, padding: "24px 12px" } satisfies CSSProperties,
  card: {
    width: "100%",
    maxWidth: "600px",
    margin: "0 auto",
    backgroundColor: C.card,
    border: `1px solid ${C.border}`,
    borderRadius: "8px",
  } satisfies CSSProperties,
  p: { margin: "0 0 14px", fontSize: "15px", lineHeight: "23px", color: C.text } satisfies CSSProperties,
  label: {
    margin: "0 0 6px",
    fontSize: "12px",
    lineHeight: "16px",
    color: C.muted,
    fontWeight: 600,
  } satisfies CSSProperties,
};

function Mark() {
  // A text mark, not an image: no remote request, nothing for a mail client to block.
  return (
    <table role="presentation" cellPadding={0} cellSpacing={0} style={{ borderCollapse: "collapse" }}>
      <tbody>
        <tr>
          <td
            style={{
              width: "28px",
              height: "28px",
              backgroundColor: C.ink,
              borderRadius: "6px",
              color: "#e2eaf5",
              fontSize: "14px",
              fontWeight: 700,
              textAlign: "center",
              lineHeight: "28px",
            }}
          >
            B
          </td>
          <td style={{ paddingLeft: "10px", fontSize: "16px", fontWeight: 600, color: C.text }}>Benchclear</td>
        </tr>
      </tbody>
    </table>
  );
}

// The tier glyph (lib/tier-glyph.ts) inline, before the words "Tier N · label". Clients that drop
// inline SVG still show the words, which carry the tier on their own.
function TierGlyph({ tier }: { tier: Tier }) {
  const g = TIER_GLYPHS[tier];
  const colour = TIER_COLOURS[tier].swatch;
  return (
    <svg
      viewBox={TIER_GLYPH_VIEWBOX}
      width="16"
      height="16"
      aria-hidden="true"
      style={{ display: "inline-block", verticalAlign: "-3px", marginRight: "6px" }}
    >
      {g.ring && <path d={g.ring.d} fill="none" stroke={colour} strokeWidth={g.ring.stroke} />}
      {g.solid ? (
        <path d={g.shape} fill={colour} />
      ) : (
        <path d={g.shape} fill="none" stroke={colour} strokeWidth={g.shapeStroke} strokeLinejoin="round" />
      )}
      <path
        d={g.numeral}
        fill="none"
        stroke={g.solid ? "#ffffff" : colour}
        strokeWidth={g.numeralStroke}
        strokeLinecap="round"
        strokeLinejoin="round"
      />
    </svg>
  );
}

function Block({ block }: { block: EmailBlock }): ReactNode {
  switch (block.type) {
    case "text":
      return <p style={s.p}>{block.text}</p>;
    case "facts":
      return (
        <table
          role="presentation"
          cellPadding={0}
          cellSpacing={0}
          style={{ width: "100%", borderCollapse: "collapse", margin: "0 0 16px", fontSize: "14px" }}
        >
          <tbody>
            {block.rows.map((row) => (
              <tr key={row.label}>
                <td
                  style={{
                    padding: "6px 12px 6px 0",
                    color: C.muted,
                    verticalAlign: "top",
                    whiteSpace: "nowrap",
                    borderTop: `1px solid ${C.border}`,
                  }}
                >
                  {row.label}
                </td>
                <td
                  style={{ padding: "6px 0", color: C.text, verticalAlign: "top", borderTop: `1px solid ${C.border}` }}
                >
                  {row.tier !== undefined && <TierGlyph tier={row.tier} />}
                  {row.value}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      );
    case "quote":
      return (
        <div style={{ margin: "0 0 16px" }}>
          <p style={s.label}>{block.label}</p>
          <div
            style={{
              borderLeft: `3px solid ${C.ink}`,
              backgroundColor: C.inkTint,
              padding: "10px 14px",
              fontSize: "14px",
              lineHeight: "21px",
              whiteSpace: "pre-wrap",
              color: C.text,
            }}
          >
            {block.text}
          </div>
        </div>
      );
    case "list":
      return (
        <div style={{ margin: "0 0 16px" }}>
          <p style={s.label}>{block.label}</p>
          <ul style={{ margin: 0, paddingLeft: "20px", fontSize: "14px", lineHeight: "21px" }}>
            {block.items.map((item, i) => (
              <li key={i} style={{ margin: "0 0 4px" }}>
                {item}
              </li>
            ))}
          </ul>
        </div>
      );
    case "action":
      return (
        <table role="presentation" cellPadding={0} cellSpacing={0} style={{ margin: "4px 0 18px" }}>
          <tbody>
            <tr>
              <td style={{ backgroundColor: C.ink, borderRadius: "6px" }}>
                <a
                  href={block.url}
                  style={{
                    display: "inline-block",
                    padding: "10px 18px",
                    color: "#ffffff",
                    fontSize: "15px",
                    fontWeight: 600,
                    textDecoration: "none",
                  }}
                >
                  {block.label}
                </a>
              </td>
            </tr>
          </tbody>
        </table>
      );
    case "about-figures":
      // A note in the interface's ink with the information symbol, never styled as a hazard sign.
      return (
        <table
          role="note"
          aria-label={ABOUT_FIGURES_TITLE}
          cellPadding={0}
          cellSpacing={0}
          style={{
            width: "100%",
            borderCollapse: "collapse",
            margin: "0 0 16px",
            border: `1px solid ${C.border}`,
            borderLeft: `4px solid ${C.ink}`,
          }}
        >
          <tbody>
            <tr>
              <td style={{ width: "20px", padding: "10px 0 10px 12px", verticalAlign: "top" }}>
                <svg viewBox={INFO_SYMBOL.viewBox} width="18" height="18" aria-hidden="true">
                  <path d={INFO_SYMBOL.ring} fill="none" stroke={C.ink} strokeWidth={INFO_SYMBOL.stroke} />
                  <path
                    d={INFO_SYMBOL.stem}
                    fill="none"
                    stroke={C.ink}
                    strokeWidth={INFO_SYMBOL.stroke * 1.2}
                    strokeLinecap="round"
                  />
                  <path d={INFO_SYMBOL.dot} fill={C.ink} />
                </svg>
              </td>
              <td style={{ padding: "10px 12px", fontSize: "13px", lineHeight: "19px", color: "#44403c" }}>
                <strong style={{ color: C.text }}>{ABOUT_FIGURES_TITLE}:</strong> {ABOUT_FIGURES_TEXT}
              </td>
            </tr>
          </tbody>
        </table>
      );
  }
}

/** The whole HTML document of one e-mail. */
export function EmailDocument({ content, frame }: { content: EmailContent; frame: EmailFrame }) {
  const tone = TONE[content.tone];
  const links = content.blocks.filter((b): b is Extract<EmailBlock, { type: "action" }> => b.type === "action");
  return (
    <html lang="en">
      {/* A standalone e-mail document rendered to a string, not a Next.js page. */}
      {/* eslint-disable-next-line @next/next/no-head-element */}
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="color-scheme" content="light" />
        <title>{content.heading}</title>
      </head>
      <body style={s.body}>
        <div style={{ display: "none", maxHeight: 0, overflow: "hidden", opacity: 0 }}>{content.preheader}</div>
        <table role="presentation" cellPadding={0} cellSpacing={0} style={s.outer}>
          <tbody>
            <tr>
              <td>
                <table role="presentation" cellPadding={0} cellSpacing={0} style={s.card}>
                  <tbody>
                    <tr>
                      <td
                        style={{ height: "4px", backgroundColor: tone.bar, borderRadius: "8px 8px 0 0", fontSize: 0 }}
                      >
                        &nbsp;
                      </td>
                    </tr>
                    <tr>
                      <td style={{ padding: "18px 24px 0" }}>
                        <Mark />
                      </td>
                    </tr>
                    <tr>
                      <td style={{ padding: "18px 24px 4px" }}>
                        <p style={{ ...s.label, color: tone.bar, textTransform: "uppercase", letterSpacing: "0.04em" }}>
                          {tone.label}
                        </p>
                        <h1 style={{ margin: "0 0 14px", fontSize: "21px", lineHeight: "28px", fontWeight: 600 }}>
                          {content.heading}
                        </h1>
                        {content.blocks.map((block, i) => (
                          <Block key={i} block={block} />
                        ))}
                        {links.length > 0 && (
                          <p style={{ margin: "0 0 16px", fontSize: "12px", lineHeight: "18px", color: C.faint }}>
                            If the button does not work, copy this address into your browser:{" "}
                            <span style={{ fontFamily: mono, wordBreak: "break-all" }}>{links[0].url}</span>
                          </p>
                        )}
                      </td>
                    </tr>
                    <tr>
                      <td
                        style={{
                          padding: "14px 24px 18px",
                          borderTop: `1px solid ${C.border}`,
                          fontSize: "12px",
                          lineHeight: "18px",
                          color: C.muted,
                        }}
                      >
                        <p style={{ margin: "0 0 6px" }}>{content.reason}</p>
                        <p style={{ margin: 0 }}>
                          Benchclear · {frame.institutionName} ·{" "}
                          <a href={frame.appUrl} style={{ color: C.muted }}>
                            {frame.appUrl.replace(/^https?:\/\//, "")}
                          </a>
                        </p>
                      </td>
                    </tr>
                  </tbody>
                </table>
              </td>
            </tr>
          </tbody>
        </table>
      </body>
    </html>
  );
}

/** The plain-text part: the same content, with links written out in full. */
export function textBody(content: EmailContent, frame: EmailFrame): string {
  const out: string[] = [content.heading, "=".repeat(Math.min(content.heading.length, 72)), ""];
  for (const block of content.blocks) {
    switch (block.type) {
      case "text":
        out.push(block.text, "");
        break;
      case "facts": {
        const width = Math.max(...block.rows.map((r) => r.label.length));
        for (const row of block.rows) out.push(`${`${row.label}:`.padEnd(width + 2)}${row.value}`);
        out.push("");
        break;
      }
      case "quote":
        out.push(`${block.label}:`, ...block.text.split(/\r?\n|\r/).map((line) => `> ${line}`), "");
        break;
      case "list":
        out.push(`${block.label}:`, ...block.items.map((item) => `  - ${item}`), "");
        break;
      case "action":
        out.push(`${block.label}: ${block.url}`, "");
        break;
      case "about-figures":
        out.push(EMAIL_ABOUT_FIGURES, "");
        break;
    }
  }
  out.push("--", content.reason, `Benchclear · ${frame.institutionName} · ${frame.appUrl}`);
  return out.join("\n") + "\n";
}
