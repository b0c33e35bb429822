/**
 * Read the metadata_props of an ONNX file.
 *
 * onnxruntime-node exposes input/output shapes but not the model's metadata_props, and no protobuf library is a
 * dependency; the few fields needed sit at the top level of ModelProto, so a walk over the protobuf wire format
 * (varint keys, length-delimited fields) reads them without decoding the graph.
 *
 * Field numbers from onnx/onnx.proto (from memory of the published file): ModelProto.ir_version = 1,
 * ModelProto.graph = 7, ModelProto.metadata_props = 14; StringStringEntryProto.key = 1, .value = 2.
 * Wire types from the Protocol Buffers encoding guide: 0 varint, 1 fixed 64-bit, 2 length-delimited, 5 fixed 32-bit.
 */

const IR_VERSION = 1;
const GRAPH = 7;
const METADATA_PROPS = 14;
const ENTRY_KEY = 1;
const ENTRY_VALUE = 2;

const enum Wire {
  Varint = 0,
  Fixed64 = 1,
  Bytes = 2,
  Fixed32 = 5,
}

interface Field {
  number: number;
  wire: number;
  /** Varint value (wire 0) or, for wire 2, the payload bounds. */
  value: number;
  start: number;
  end: number;
}

class WireReader {
  pos: number;

  constructor(
    private readonly buf: Uint8Array,
    start: number,
    private readonly end: number,
  ) {
    this.pos = start;
  }

  done(): boolean {
    return this.pos >= this.end;
  }

  varint(): number {
    let result = 0;
    let mul = 1;
    for (let i = 0; i < 10; i++) {
      if (this.pos >= this.end) throw new Error('truncated varint');
      const byte = this.buf[this.pos++];
      result += (byte & 0x7f) * mul;
      if ((byte & 0x80) === 0) return result;
      mul *= 128;
    }
    throw new Error('varint longer than 10 bytes');
  }

  field(): Field {
    const key = this.varint();
    const number = Math.floor(key / 8);
    const wire = key % 8;
    if (number === 0) throw new Error('field number 0');
    switch (wire) {
      case Wire.Varint: {
        const value = this.varint();
        return { number, wire, value, start: this.pos, end: this.pos };
      }
      case Wire.Fixed64:
        return this.skip(number, wire, 8);
      case Wire.Fixed32:
        return this.skip(number, wire, 4);
      case Wire.Bytes:
        return this.skip(number, wire, this.varint());
      default:
        throw new Error(`wire type ${wire} is not used by ONNX`);
    }
  }

  private skip(number: number, wire: number, length: number): Field {
    const start = this.pos;
    const end = start + length;
    if (end > this.end) throw new Error('field runs past the end of the file');
    this.pos = end;
    return { number, wire, value: length, start, end };
  }
}

const utf8 = new TextDecoder('utf-8', { fatal: true });

/**
 * Metadata key/value pairs of an ONNX model. Throws a plain Error (the caller adds the file name) when the bytes are
 * not a protobuf ModelProto with an IR version and a graph.
 */
export function readOnnxMetadata(bytes: Uint8Array): Map<string, string> {
  const props = new Map<string, string>();
  const top = new WireReader(bytes, 0, bytes.length);
  let hasIrVersion = false;
  let hasGraph = false;
  while (!top.done()) {
    const f = top.field();
    if (f.number === IR_VERSION && f.wire === Wire.Varint) hasIrVersion = true;
    else if (f.number === GRAPH && f.wire === Wire.Bytes) hasGraph = true;
    else if (f.number === METADATA_PROPS && f.wire === Wire.Bytes) {
      const entry = new WireReader(bytes, f.start, f.end);
      let key = '';
      let value = '';
      while (!entry.done()) {
        const e = entry.field();
        if (e.wire !== Wire.Bytes) continue;
        const text = utf8.decode(bytes.subarray(e.start, e.end));
        if (e.number === ENTRY_KEY) key = text;
        else if (e.number === ENTRY_VALUE) value = text;
      }
      props.set(key, value);
    }
  }
  if (!hasIrVersion || !hasGraph) throw new Error('no ONNX ir_version or graph found');
  return props;
}
