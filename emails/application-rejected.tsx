import { appLink, type EmailBuilder } from "./context";

// To the applicant: a safety officer rejected the application (final; a new application may follow).
export const applicationRejectedEmail: EmailBuilder<"application_rejected"> = (data, ctx) => ({
  preheader: `${data.signerName} did not approve "${data.title}".`,
  heading: `Not approved: ${data.title}`,
  tone: "danger",
  blocks: [
    {
      type: "text",
      text: `${data.signerName} rejected your application. The set-up may not be run under this application. You may start a new application that addresses the reasons below.`,
    },
    { type: "quote", label: `Reasons given by ${data.signerName}`, text: data.comment || "(no reason given)" },
    { type: "action", label: "Open the application", url: appLink(ctx, `/applications/${data.applicationId}`) },
    { type: "about-figures" },
  ],
  reason: "You get this e-mail because you submitted this application in Benchclear.",
});
