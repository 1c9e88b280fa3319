// What the application form fetches with import() for the live hazard preview (use-hazard-engine.ts):
// the engine, the set-up text parser and the rules' required controls, the same code the server runs.
export { liveAssessmentOfJson } from "@/app/_components/hazard/use-live-assessment";
export { requiredControls } from "@/lib/hazard";
