import { appLink, tierFact, type EmailBuilder } from "./context";

// To the safety officers: a reviewer recommended an application and it waits for the final decision.
export const applicationRecommendedEmail: EmailBuilder<"application_recommended"> = (data, ctx) => ({
  preheader: `${data.reviewerName} recommended "${data.title}"; it waits for a safety officer.`,
  heading: `Recommended for approval: ${data.title}`,
  tone: "warn",
  blocks: [
    {
      type: "text",
      text: `${data.reviewerName} reviewed this application and recommended it. It now waits for a safety officer to approve it (with conditions if needed), return it or reject it.`,
    },
    {
      type: "facts",
      rows: [
        { label: "Application", value: data.title },
        { label: "Recommended by", value: data.reviewerName },
        tierFact(data.tier),
      ],
    },
    { type: "action", label: "Open the application", url: appLink(ctx, `/applications/${data.applicationId}`) },
  ],
  reason: "You get this e-mail because you are a safety officer in Benchclear and give the final approval.",
});
