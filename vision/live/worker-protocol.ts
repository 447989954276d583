import type { DetectionStep, DetectorConfig } from "./detector";

export type TransferableFrame = ImageBitmap | VideoFrame;

export type WorkerRequest =
  | { type: "init"; config: Omit<DetectorConfig, "wasmAsModule"> }
  | { type: "frame"; id: number; t: number; image: TransferableFrame; paired: boolean }
  | { type: "pair-model"; url: string }
  | { type: "close" };

export type WorkerResponse =
  | { type: "ready" }
  | { type: "error"; message: string }
  | { type: "result"; id: number; step: DetectionStep }
  | { type: "frame-error"; id: number; message: string }
  | { type: "pair-ready" }
  | { type: "pair-error"; message: string };
