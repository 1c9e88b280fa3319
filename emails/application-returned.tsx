import { appLink, type EmailBuilder } from "./context";

// To the applicant: a reviewer or safety officer sent the application back with comments.
export const applicationReturnedEmail: EmailBuilder<"application_returned"> = (data, ctx) => ({
  preheader: `${data.reviewerName} returned "${data.title}" with comments.`,
  heading: `Returned for changes: ${data.title}`,
  tone: "warn",
  blocks: [
    {
      type: "text",
      text: `${data.reviewerName} returned your application for changes. Read the comments, edit the application and submit it again; the review starts over with the new revision.`,
    },
    { type: "quote", label: `Comments from ${data.reviewerName}`, text: data.comment || "(no comment given)" },
    ...(data.pinnedTo ? [{ type: "facts" as const, rows: [{ label: "About", value: data.pinnedTo }] }] : []),
    { type: "action", label: "Open the application", url: appLink(ctx, `/applications/${data.applicationId}`) },
  ],
  reason: "You get this e-mail because you submitted this application in Benchclear.",
});
