/**
 * TFLite model metadata: build the one record the tasks library needs (input normalisation) and attach it to a
 * model without re-encoding the model.
 *
 * Schemas: TFLite `schema.fbs` (Model: version 0, operator_codes 1, subgraphs 2, description 3, buffers 4,
 * metadata_buffer 5, metadata 6, signature_defs 7; Metadata{name, buffer}; Buffer{data, offset, size}) and TFLite
 * support `metadata_schema.fbs` 1.1.0 (file identifier "M001").
 */
import * as flatbuffers from "flatbuffers";

/** Name the TFLite metadata extractor looks for in `Model.metadata`. */
export const TFLITE_METADATA_NAME = "TFLITE_METADATA";
const MODEL_IDENTIFIER = "TFL3";
const METADATA_IDENTIFIER = "M001";
const MODEL_FIELD_COUNT = 8;
const FIELD = { version: 0, buffers: 4, metadata: 6 } as const;
// metadata_schema.fbs enum values.
const COLOR_SPACE_RGB = 1;
const CONTENT_IMAGE_PROPERTIES = 2;
const PROCESS_UNIT_NORMALIZATION = 1;
// The header keeps the original bytes at a 64-byte boundary so every aligned buffer inside them stays aligned.
const HEADER_ALIGN_BYTES = 64;
// schema.fbs: `Buffer.data:[ubyte] (force_align: 16)`.
const BUFFER_DATA_ALIGN_BYTES = 16;

export interface ImageInputNormalization {
  /** Name stored in the metadata record; informational. */
  modelName: string;
  /** Pixel value subtracted before dividing by `std` (the model sees (x - mean) / std). */
  mean: number;
  std: number;
}

/** A `ModelMetadata` flatbuffer: one subgraph, one RGB image input normalised by `(x - mean) / std`. */
export function buildImageInputMetadata({ modelName, mean, std }: ImageInputNormalization): Uint8Array {
  if (!Number.isFinite(mean)) throw new Error(`mean: expected a finite number, got ${mean}`);
  if (!Number.isFinite(std) || std <= 0) throw new Error(`std: expected a positive number, got ${std}`);
  const b = new flatbuffers.Builder(512);
  const floatVector = (values: number[]) => {
    b.startVector(4, values.length, 4);
    for (let i = values.length - 1; i >= 0; i--) b.addFloat32(values[i]);
    return b.endVector();
  };
  const offsetVector = (offsets: number[]) => {
    b.startVector(4, offsets.length, 4);
    for (let i = offsets.length - 1; i >= 0; i--) b.addOffset(offsets[i]);
    return b.endVector();
  };

  const meanVector = floatVector([mean]);
  const stdVector = floatVector([std]);
  b.startObject(2); // NormalizationOptions
  b.addFieldOffset(0, meanVector, 0);
  b.addFieldOffset(1, stdVector, 0);
  const normalization = b.endObject();

  b.startObject(2); // ProcessUnit: union type in slot 0, value in slot 1
  b.addFieldInt8(0, PROCESS_UNIT_NORMALIZATION, 0);
  b.addFieldOffset(1, normalization, 0);
  const processUnit = b.endObject();

  b.startObject(2); // ImageProperties
  b.addFieldInt8(0, COLOR_SPACE_RGB, 0);
  const imageProperties = b.endObject();

  b.startObject(3); // Content
  b.addFieldInt8(0, CONTENT_IMAGE_PROPERTIES, 0);
  b.addFieldOffset(1, imageProperties, 0);
  const content = b.endObject();

  const tensorName = b.createString("image");
  const processUnits = offsetVector([processUnit]);
  b.startObject(7); // TensorMetadata
  b.addFieldOffset(0, tensorName, 0);
  b.addFieldOffset(3, content, 0);
  b.addFieldOffset(4, processUnits, 0);
  const tensor = b.endObject();

  const inputs = offsetVector([tensor]);
  b.startObject(10); // SubGraphMetadata
  b.addFieldOffset(2, inputs, 0);
  const subgraph = b.endObject();

  const name = b.createString(modelName);
  const subgraphs = offsetVector([subgraph]);
  // 1.0.0 is the oldest parser version that understands every field written above.
  const minParserVersion = b.createString("1.0.0");
  b.startObject(8); // ModelMetadata
  b.addFieldOffset(0, name, 0);
  b.addFieldOffset(3, subgraphs, 0);
  b.addFieldOffset(7, minParserVersion, 0);
  b.finish(b.endObject(), METADATA_IDENTIFIER);
  return b.asUint8Array().slice();
}

export interface ImageInputMetadataRead {
  modelName: string | null;
  minParserVersion: string | null;
  colorSpace: number;
  mean: number[];
  std: number[];
}

/** Reads back what `buildImageInputMetadata` writes (used by tests and to report what a bundle holds). */
export function readImageInputMetadata(bytes: Uint8Array): ImageInputMetadataRead {
  const bb = new flatbuffers.ByteBuffer(bytes);
  if (!bb.__has_identifier(METADATA_IDENTIFIER)) throw new Error(`metadata: expected file identifier ${METADATA_IDENTIFIER}`);
  const root = bb.readInt32(bb.position()) + bb.position();
  const subgraph = firstTable(bb, root, 3, "ModelMetadata.subgraph_metadata");
  const tensor = firstTable(bb, subgraph, 2, "SubGraphMetadata.input_tensor_metadata");
  const content = tableField(bb, tensor, 3, "TensorMetadata.content");
  if (readUint8Field(bb, content, 0) !== CONTENT_IMAGE_PROPERTIES) throw new Error("TensorMetadata.content: expected ImageProperties");
  const imageProperties = tableField(bb, content, 1, "Content.content_properties");
  const processUnit = firstTable(bb, tensor, 4, "TensorMetadata.process_units");
  if (readUint8Field(bb, processUnit, 0) !== PROCESS_UNIT_NORMALIZATION) throw new Error("ProcessUnit.options: expected NormalizationOptions");
  const normalization = tableField(bb, processUnit, 1, "ProcessUnit.options");
  return {
    modelName: stringField(bb, root, 0),
    minParserVersion: stringField(bb, root, 7),
    colorSpace: readUint8Field(bb, imageProperties, 0),
    mean: floatVectorField(bb, normalization, 0),
    std: floatVectorField(bb, normalization, 1),
  };
}

export interface TfliteMetadataEntry {
  name: string;
  bufferIndex: number;
}

export interface TfliteModelSummary {
  version: number;
  bufferCount: number;
  metadata: TfliteMetadataEntry[];
}

/** The parts of a TFLite model's root table this module touches. Throws on anything that is not a TFLite model. */
export function readTfliteModel(model: Uint8Array): TfliteModelSummary {
  const bb = modelBuffer(model);
  const root = bb.readUint32(0);
  const versionAt = bb.__offset(root, vtableSlot(FIELD.version));
  const buffersAt = bb.__offset(root, vtableSlot(FIELD.buffers));
  const metadataAt = bb.__offset(root, vtableSlot(FIELD.metadata));
  const metadata: TfliteMetadataEntry[] = [];
  if (metadataAt) {
    const start = bb.__vector(root + metadataAt);
    const count = bb.__vector_len(root + metadataAt);
    for (let i = 0; i < count; i++) {
      const entry = bb.__indirect(start + 4 * i);
      metadata.push({ name: stringField(bb, entry, 0) ?? "", bufferIndex: readUint32Field(bb, entry, 1) });
    }
  }
  return {
    version: versionAt ? bb.readUint32(root + versionAt) : 0,
    bufferCount: buffersAt ? bb.__vector_len(root + buffersAt) : 0,
    metadata,
  };
}

/** The bytes of the model's `TFLITE_METADATA` buffer, or null when the model has none. */
export function extractTfliteMetadata(model: Uint8Array): Uint8Array | null {
  const summary = readTfliteModel(model);
  const entry = summary.metadata.find((m) => m.name === TFLITE_METADATA_NAME);
  if (!entry) return null;
  const bb = modelBuffer(model);
  const root = bb.readUint32(0);
  const buffersAt = bb.__offset(root, vtableSlot(FIELD.buffers));
  const buffer = bb.__indirect(bb.__vector(root + buffersAt) + 4 * entry.bufferIndex);
  const dataAt = bb.__offset(buffer, vtableSlot(0));
  if (!dataAt) return null;
  const start = bb.__vector(buffer + dataAt);
  return model.subarray(start, start + bb.__vector_len(buffer + dataAt));
}

/**
 * Returns a new model: a fresh header (root `Model` table, `buffers` and `metadata` vectors listing the old entries
 * plus the new ones, the new `Buffer`) in front of the untouched original bytes. Every old field is pointed forward
 * into the old data, so nothing in the model is re-encoded. Refuses a model that already carries metadata.
 */
export function injectTfliteMetadata(model: Uint8Array, metadata: Uint8Array): Uint8Array {
  const summary = readTfliteModel(model);
  if (summary.metadata.some((m) => m.name === TFLITE_METADATA_NAME)) {
    throw new Error(`model: already carries ${TFLITE_METADATA_NAME}; refusing to inject it twice`);
  }
  const old = modelBuffer(model);
  const oldRoot = old.readUint32(0);
  const oldFieldPos: (number | null)[] = [];
  for (let f = 0; f < MODEL_FIELD_COUNT; f++) {
    const at = old.__offset(oldRoot, vtableSlot(f));
    oldFieldPos.push(at ? oldRoot + at : null);
  }
  const oldVectorEntries = (field: number): number[] => {
    const pos = oldFieldPos[field];
    if (pos === null) return [];
    const start = old.__vector(pos);
    return Array.from({ length: old.__vector_len(pos) }, (_, i) => old.__indirect(start + 4 * i));
  };
  const oldBuffers = oldVectorEntries(FIELD.buffers);
  const oldMetadata = oldVectorEntries(FIELD.metadata);

  // Layout of the header, positions from the start of the new file.
  let cursor = 8; // root offset + file identifier
  const align = (n: number) => (cursor = Math.ceil(cursor / n) * n);
  const modelVtable = align(2);
  cursor += 4 + 2 * MODEL_FIELD_COUNT;
  const modelTable = align(4);
  cursor += 4 + 4 * MODEL_FIELD_COUNT;
  const buffersVector = align(4);
  cursor += 4 + 4 * (oldBuffers.length + 1);
  const metadataVector = align(4);
  cursor += 4 + 4 * (oldMetadata.length + 1);
  const bufferVtable = align(2);
  cursor += 6;
  const bufferTable = align(4);
  cursor += 8;
  const metadataVtable = align(2);
  cursor += 8;
  const metadataTable = align(4);
  cursor += 12;
  const nameBytes = new TextEncoder().encode(TFLITE_METADATA_NAME);
  const nameString = align(4);
  cursor += 4 + nameBytes.length + 1;
  // The vector's length word sits just before its 16-byte aligned data.
  const dataVector = Math.ceil((cursor + 4) / BUFFER_DATA_ALIGN_BYTES) * BUFFER_DATA_ALIGN_BYTES - 4;
  cursor = dataVector + 4 + metadata.length;
  const headerBytes = Math.ceil(cursor / HEADER_ALIGN_BYTES) * HEADER_ALIGN_BYTES;

  const out = new Uint8Array(headerBytes + model.length);
  out.set(model, headerBytes);
  const view = new DataView(out.buffer);
  const u32 = (pos: number, v: number) => view.setUint32(pos, v, true);
  const u16 = (pos: number, v: number) => view.setUint16(pos, v, true);
  const forward = (from: number, to: number) => {
    if (to <= from) throw new Error(`internal: offset must point forward (${from} -> ${to})`);
    u32(from, to - from);
  };
  const old2new = (pos: number) => headerBytes + pos;

  u32(0, modelTable);
  out.set(new TextEncoder().encode(MODEL_IDENTIFIER), 4);

  u16(modelVtable, 4 + 2 * MODEL_FIELD_COUNT);
  u16(modelVtable + 2, 4 + 4 * MODEL_FIELD_COUNT);
  view.setInt32(modelTable, modelTable - modelVtable, true);
  for (let f = 0; f < MODEL_FIELD_COUNT; f++) {
    const slot = modelTable + 4 + 4 * f;
    const oldPos = oldFieldPos[f];
    let present = true;
    if (f === FIELD.version) {
      u32(slot, summary.version);
    } else if (f === FIELD.buffers) {
      forward(slot, buffersVector);
    } else if (f === FIELD.metadata) {
      forward(slot, metadataVector);
    } else if (oldPos !== null) {
      // Every other field of Model is an offset: point it at the same target inside the old bytes.
      forward(slot, old2new(oldPos + old.readUint32(oldPos)));
    } else {
      present = false;
    }
    u16(modelVtable + 4 + 2 * f, present ? 4 + 4 * f : 0);
  }

  const writeVector = (at: number, targets: number[]) => {
    u32(at, targets.length);
    targets.forEach((target, i) => forward(at + 4 + 4 * i, target));
  };
  writeVector(buffersVector, [...oldBuffers.map(old2new), bufferTable]);
  writeVector(metadataVector, [...oldMetadata.map(old2new), metadataTable]);

  u16(bufferVtable, 6);
  u16(bufferVtable + 2, 8);
  u16(bufferVtable + 4, 4);
  view.setInt32(bufferTable, bufferTable - bufferVtable, true);
  forward(bufferTable + 4, dataVector);

  u16(metadataVtable, 8);
  u16(metadataVtable + 2, 12);
  u16(metadataVtable + 4, 4);
  u16(metadataVtable + 6, 8);
  view.setInt32(metadataTable, metadataTable - metadataVtable, true);
  forward(metadataTable + 4, nameString);
  u32(metadataTable + 8, oldBuffers.length);

  u32(nameString, nameBytes.length);
  out.set(nameBytes, nameString + 4);

  u32(dataVector, metadata.length);
  out.set(metadata, dataVector + 4);
  return out;
}

function modelBuffer(model: Uint8Array): flatbuffers.ByteBuffer {
  if (model.length < 8) throw new Error(`model: expected a TFLite flatbuffer, got ${model.length} bytes`);
  const bb = new flatbuffers.ByteBuffer(model);
  if (!bb.__has_identifier(MODEL_IDENTIFIER)) throw new Error(`model: expected file identifier ${MODEL_IDENTIFIER} at bytes 4-8`);
  return bb;
}

function vtableSlot(field: number): number {
  return 4 + 2 * field;
}

function tableField(bb: flatbuffers.ByteBuffer, table: number, field: number, label: string): number {
  const at = bb.__offset(table, vtableSlot(field));
  if (!at) throw new Error(`${label}: missing`);
  return bb.__indirect(table + at);
}

function firstTable(bb: flatbuffers.ByteBuffer, table: number, field: number, label: string): number {
  const at = bb.__offset(table, vtableSlot(field));
  if (!at || bb.__vector_len(table + at) === 0) throw new Error(`${label}: expected at least one entry`);
  return bb.__indirect(bb.__vector(table + at));
}

function stringField(bb: flatbuffers.ByteBuffer, table: number, field: number): string | null {
  const at = bb.__offset(table, vtableSlot(field));
  return at ? (bb.__string(table + at) as string) : null;
}

function readUint8Field(bb: flatbuffers.ByteBuffer, table: number, field: number): number {
  const at = bb.__offset(table, vtableSlot(field));
  return at ? bb.readUint8(table + at) : 0;
}

function readUint32Field(bb: flatbuffers.ByteBuffer, table: number, field: number): number {
  const at = bb.__offset(table, vtableSlot(field));
  return at ? bb.readUint32(table + at) : 0;
}

function floatVectorField(bb: flatbuffers.ByteBuffer, table: number, field: number): number[] {
  const at = bb.__offset(table, vtableSlot(field));
  if (!at) return [];
  const start = bb.__vector(table + at);
  return Array.from({ length: bb.__vector_len(table + at) }, (_, i) => bb.readFloat32(start + 4 * i));
}
