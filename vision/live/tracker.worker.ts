/// <reference lib="webworker" />
/**
 * Worker side of the tracker: runs the landmarkers off the main thread so a slow frame never freezes the page.
 * Frames arrive transferred (ImageBitmap or VideoFrame) and are closed here once used.
 */
import { createDetector, type Detector } from "./detector";
import type { WorkerRequest, WorkerResponse } from "./worker-protocol";

const scope = self as unknown as DedicatedWorkerGlobalScope;
let detector: Detector | null = null;

function reply(message: WorkerResponse) {
  scope.postMessage(message);
}

scope.onmessage = async (event: MessageEvent<WorkerRequest>) => {
  const message = event.data;
  if (message.type === "init") {
    try {
      detector = await createDetector({ ...message.config, wasmAsModule: true });
      reply({ type: "ready" });
    } catch (error) {
      reply({ type: "error", message: error instanceof Error ? error.message : String(error) });
    }
  } else if (message.type === "frame") {
    try {
      if (!detector) throw new Error("worker: frame received before the landmarkers were ready");
      const step = detector.detect(message.image, message.t, message.paired);
      reply({ type: "result", step, id: message.id });
    } catch (error) {
      reply({ type: "frame-error", id: message.id, message: error instanceof Error ? error.message : String(error) });
    } finally {
      message.image.close();
    }
  } else if (message.type === "pair-model") {
    try {
      if (!detector) throw new Error("worker: second model asked for before the landmarkers were ready");
      await detector.loadPairModel(message.url);
      reply({ type: "pair-ready" });
    } catch (error) {
      reply({ type: "pair-error", message: error instanceof Error ? error.message : String(error) });
    }
  } else if (message.type === "close") {
    detector?.close();
    detector = null;
    scope.close();
  }
};
