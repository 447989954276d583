/**
 * Browser side: a recorded clip is kept in IndexedDB from the moment recording stops until the server has confirmed
 * it, so a reload, a closed tab, a dropped connection or a server restart loses nothing the client recorded. The
 * upload id goes with it, so sending it again later is stored once.
 */
export interface PendingClip {
  uploadUid: string;
  clientId: string;
  motion: string;
  side: string;
  /** Added later: clips kept by an older page have none (the therapist then chooses them when measuring). */
  digit?: string;
  condition?: string;
  note: string;
  file: File;
  recordedAt: number;
}

const DB_NAME = "kinarc-uploads";
const STORE = "pending-clips";

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB_NAME, 1);
    req.onupgradeneeded = () => req.result.createObjectStore(STORE, { keyPath: "uploadUid" });
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

async function run<T>(mode: IDBTransactionMode, action: (store: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  const db = await open();
  try {
    return await new Promise<T>((resolve, reject) => {
      const tx = db.transaction(STORE, mode);
      const req = action(tx.objectStore(STORE));
      tx.oncomplete = () => resolve(req.result);
      tx.onerror = () => reject(tx.error);
    });
  } finally {
    db.close();
  }
}

export const savePendingClip = (clip: PendingClip) => run("readwrite", (s) => s.put(clip)).then(() => undefined);
export const deletePendingClip = (uploadUid: string) => run("readwrite", (s) => s.delete(uploadUid)).then(() => undefined);
export const listPendingClips = (clientId: string) =>
  run<PendingClip[]>("readonly", (s) => s.getAll() as IDBRequest<PendingClip[]>).then((all) => all.filter((c) => c.clientId === clientId).sort((a, b) => a.recordedAt - b.recordedAt));
