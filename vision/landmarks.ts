import type { Digit } from "@/lib/motions/catalog";
import type { Vec3 } from "./vec";

// Landmark order of the 21-point hand model used by MediaPipe Hands and its successors (tasks-vision HandLandmarker).
export const LANDMARK_COUNT = 21;
export const WRIST = 0;
export const THUMB_CMC = 1;
export const THUMB_MCP = 2;
export const THUMB_IP = 3;
export const THUMB_TIP = 4;
export const INDEX_MCP = 5;
export const MIDDLE_MCP = 9;
export const RING_MCP = 13;
export const LITTLE_MCP = 17;

/** Base-to-tip landmark chain of each digit: [MCP, PIP, DIP, tip] for fingers, [CMC, MCP, IP, tip] for the thumb. */
export const DIGIT_CHAIN: Record<Digit, readonly [number, number, number, number]> = {
  thumb: [1, 2, 3, 4],
  index: [5, 6, 7, 8],
  middle: [9, 10, 11, 12],
  ring: [13, 14, 15, 16],
  little: [17, 18, 19, 20],
};

/** 21 points in metres, camera axes: x right, y down, z away from the camera (an unmirrored image). */
export type HandLandmarks = readonly Vec3[];
