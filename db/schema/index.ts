// Every table, one module per domain. drizzle.config.ts and db/index.ts read this file.
export * from "./users";
export * from "./auth";
export * from "./audit";
export * from "./mail";
export * from "./settings";
export * from "./apparatus";
export * from "./applications";
export * from "./review";
export * from "./permits";
export * from "./ratelimit";
export * from "./apparatus-changes";
export * from "./training";
export * from "./checks";
export * from "./incidents";
