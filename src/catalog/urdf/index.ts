/** URDF in and out (Node side: file formats, not computation). */
export * from "./read";
export * from "./import";
export * from "./export";
