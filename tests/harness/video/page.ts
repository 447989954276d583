import { type Participant, type RemoteTrack, Room, RoomEvent, Track } from "livekit-client";

/**
 * Browser side of the video harness: drives the unmodified livekit-client against a media server and
 * records what a page sees, for tests and benchmarks to read through `window.videoHarness`.
 */

export interface ReceivedMessage {
  fromIdentity: string | undefined;
  text: string;
  topic: string | undefined;
}

export interface HarnessState {
  connectionState: string;
  /** Milliseconds from `join` being called to the room being connected. */
  joinMs: number | undefined;
  remoteIdentities: string[];
  departedIdentities: string[];
  messages: ReceivedMessage[];
  /** Video frames presented per remote identity, counted with requestVideoFrameCallback. */
  videoFramesByIdentity: Record<string, number>;
  /** `currentTime` of each remote identity's <video>, in seconds. */
  videoTimeSByIdentity: Record<string, number>;
  subscribedKindsByIdentity: Record<string, string[]>;
  /** Kinds of each remote identity's tracks that are muted now. */
  mutedKindsByIdentity: Record<string, string[]>;
  unpublishedKindsByIdentity: Record<string, string[]>;
  /** The video codec each remote identity's camera is announced with (TrackInfo.mimeType). */
  videoMimeTypeByIdentity: Record<string, string>;
  reconnections: number;
}

export interface JoinOptions {
  /** false goes straight to the two-connection signalling path; true tries /rtc/v1 first and falls back. */
  singlePeerConnection: boolean;
  /** A reliable message to send each participant the moment it appears, as a prompt would be. */
  greeting?: string;
}

const state: HarnessState = {
  connectionState: "disconnected",
  joinMs: undefined,
  remoteIdentities: [],
  departedIdentities: [],
  messages: [],
  videoFramesByIdentity: {},
  videoTimeSByIdentity: {},
  subscribedKindsByIdentity: {},
  mutedKindsByIdentity: {},
  unpublishedKindsByIdentity: {},
  videoMimeTypeByIdentity: {},
  reconnections: 0,
};
const videos = new Map<string, HTMLVideoElement>();
let room: Room | undefined;

function countFrames(identity: string, video: HTMLVideoElement): void {
  const onFrame = () => {
    state.videoFramesByIdentity[identity] = (state.videoFramesByIdentity[identity] ?? 0) + 1;
    video.requestVideoFrameCallback(onFrame);
  };
  video.requestVideoFrameCallback(onFrame);
}

function addKind(byIdentity: Record<string, string[]>, participant: Participant, kind: string): void {
  byIdentity[participant.identity] = [...(byIdentity[participant.identity] ?? []), kind];
}

function attach(track: RemoteTrack, participant: Participant): void {
  const identity = participant.identity;
  addKind(state.subscribedKindsByIdentity, participant, track.kind);
  const element = track.attach();
  element.dataset.identity = identity;
  document.body.append(element);
  if (track.kind === Track.Kind.Video) {
    const video = element as HTMLVideoElement;
    videos.set(identity, video);
    countFrames(identity, video);
  }
}

async function join(url: string, token: string, options: JoinOptions): Promise<string> {
  // Against the development media server: one quality per track and no bandwidth adaptation.
  room = new Room({
    adaptiveStream: false,
    dynacast: false,
    singlePeerConnection: options.singlePeerConnection,
    publishDefaults: { simulcast: false },
  });
  room
    .on(RoomEvent.ConnectionStateChanged, (connectionState) => {
      state.connectionState = connectionState;
    })
    .on(RoomEvent.Reconnected, () => {
      state.reconnections += 1;
    })
    .on(RoomEvent.ParticipantConnected, (participant) => {
      state.remoteIdentities = [...new Set([...state.remoteIdentities, participant.identity])];
      if (options.greeting) {
        void sendText(options.greeting, { reliable: true, destinationIdentities: [participant.identity] });
      }
    })
    .on(RoomEvent.ParticipantDisconnected, (participant) => {
      state.departedIdentities.push(participant.identity);
      state.remoteIdentities = state.remoteIdentities.filter((identity) => identity !== participant.identity);
    })
    .on(RoomEvent.TrackSubscribed, (track, publication, participant) => {
      if (track.kind === Track.Kind.Video && publication.mimeType) {
        state.videoMimeTypeByIdentity[participant.identity] = publication.mimeType;
      }
      attach(track, participant);
    })
    .on(RoomEvent.TrackMuted, (publication, participant) => addKind(state.mutedKindsByIdentity, participant, publication.kind))
    .on(RoomEvent.TrackUnmuted, (publication, participant) => {
      const muted = state.mutedKindsByIdentity[participant.identity] ?? [];
      state.mutedKindsByIdentity[participant.identity] = muted.filter((kind) => kind !== publication.kind);
    })
    .on(RoomEvent.TrackUnpublished, (publication, participant) =>
      addKind(state.unpublishedKindsByIdentity, participant, publication.kind),
    )
    .on(RoomEvent.DataReceived, (payload, participant, _kind, topic) => {
      state.messages.push({ fromIdentity: participant?.identity, text: new TextDecoder().decode(payload), topic });
    });
  const startedAt = performance.now();
  await room.connect(url, token);
  state.joinMs = performance.now() - startedAt;
  state.remoteIdentities = [...room.remoteParticipants.values()].map((participant) => participant.identity);
  return room.localParticipant.sid;
}

function connected(): Room {
  if (!room) throw new Error("videoHarness: call join(url, token, options) first");
  return room;
}

async function publishCameraAndMicrophone(videoCodec: "vp8" | "h264" = "vp8"): Promise<void> {
  await connected().localParticipant.setCameraEnabled(true, undefined, { videoCodec });
  await connected().localParticipant.setMicrophoneEnabled(true);
}

async function setCameraMuted(muted: boolean): Promise<void> {
  await connected().localParticipant.setCameraEnabled(!muted);
}

async function unpublishMicrophone(): Promise<void> {
  const microphone = connected().localParticipant.getTrackPublication(Track.Source.Microphone)?.track;
  if (!microphone) throw new Error("videoHarness: no microphone published");
  await connected().localParticipant.unpublishTrack(microphone);
}

async function sendText(
  text: string,
  options: { reliable: boolean; destinationIdentities?: string[]; topic?: string },
): Promise<void> {
  await connected().localParticipant.publishData(new TextEncoder().encode(text), options);
}

function snapshot(): HarnessState {
  for (const [identity, video] of videos) state.videoTimeSByIdentity[identity] = video.currentTime;
  return structuredClone(state);
}

async function dropSignalConnection(): Promise<void> {
  await connected().simulateScenario("signal-reconnect");
}

async function leave(): Promise<void> {
  await connected().disconnect();
}

const api = {
  join,
  publishCameraAndMicrophone,
  setCameraMuted,
  unpublishMicrophone,
  sendText,
  snapshot,
  dropSignalConnection,
  leave,
};
export type VideoHarness = typeof api;

declare global {
  interface Window {
    videoHarness: VideoHarness;
  }
}

window.videoHarness = api;
