import type { EmailBuilder } from "./context";
import { formatInstant } from "./context";

// To a person an admin invited: the single-use link that lets them set a password.
export const invitationEmail: EmailBuilder<"invitation"> = (data, ctx) => ({
  preheader: `${data.invitedBy} invited you to Benchclear. Set your password to start.`,
  heading: `You are invited to Benchclear`,
  tone: "info",
  blocks: [
    { type: "text", text: `Hello ${data.name},` },
    {
      type: "text",
      text: `${data.invitedBy} invited you to Benchclear, ${ctx.institutionName}'s desk for high-voltage demonstration and bench permits. Open the link below and choose a password to activate your account.`,
    },
    { type: "action", label: "Accept the invitation", url: data.url ?? "" },
    {
      type: "text",
      text: `The link works once and expires on ${formatInstant(data.expiresAt, ctx.timeZone)}. If it has expired, ask an admin for a new one.`,
    },
  ],
  reason: `You get this e-mail because ${data.invitedBy} entered this address in Benchclear's invitation form. If you did not expect it, ignore it: nothing happens unless the link is used.`,
});
