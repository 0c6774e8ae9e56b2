export * from "./numbers";
export * from "./bytes";
export * from "./dates";
export * from "./axis";
