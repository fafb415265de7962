export * from "./errors";
export * from "./exif";
export * from "./process";
export * from "./sniff";
export * from "./upload-request";
