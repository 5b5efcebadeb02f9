// Every table of Tributary, one file per area; drizzle-kit reads this index.
export * from "./auth";
export * from "./workspaces";
export * from "./jobs";
export * from "./mail";
export * from "./datasets";
export * from "./dataset-uploads";
export * from "./fits";
export * from "./scenarios";
export * from "./reviews";
