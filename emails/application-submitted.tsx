import { appLink, tierFact, type EmailBuilder } from "./context";

// To the reviewers of the application's department: an application waits for their review.
export const applicationSubmittedEmail: EmailBuilder<"application_submitted"> = (data, ctx) => ({
  preheader: `${data.applicantName} submitted "${data.title}" for review.`,
  heading: `Review requested: ${data.title}`,
  tone: "warn",
  blocks: [
    {
      type: "text",
      text: `${data.applicantName} submitted an application and it is waiting for a reviewer. Check the figures, the controls and the attachments, then return it with comments or recommend it.`,
    },
    {
      type: "facts",
      rows: [
        { label: "Application", value: data.title },
        { label: "Applicant", value: data.applicantName },
        tierFact(data.tier),
        ...(data.departmentName ? [{ label: "Department", value: data.departmentName }] : []),
      ],
    },
    { type: "action", label: "Open the application", url: appLink(ctx, `/applications/${data.applicationId}`) },
  ],
  reason: `You get this e-mail because you review applications for ${data.departmentName ?? "this application's department"} in Benchclear.`,
});
