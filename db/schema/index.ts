export * from "./auth";
export * from "./projects";
export * from "./field";
export * from "./lab";
export * from "./scans";
export * from "./audit";
export * from "./sync";
