export * from "./angles";
export * from "./coordinates";
export * from "./distance";
export * from "./dms";
export * from "./structure";
export * from "./utm";
export * from "./zoned-time";
