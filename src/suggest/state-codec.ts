/**
 * A learned state as bytes: its plain data as JSON, its typed arrays (the soft shares, millions
 * of doubles on a large study) as their bytes after it. As JSON text the doubles took 70 MB at
 * 20,000 answers and a second copy while compressed; as bytes they are exact and read back as
 * they were.
 *
 * Layout: "trstate1", the JSON's length (uint32), the JSON (UTF-8), zero bytes up to a multiple
 * of 8, then each array's bytes, each starting at a multiple of 8. In the JSON an array is
 * {"$bytes": [type, offset, length]}, the offset counted from the start of the array bytes.
 */
import { Buffer } from 'node:buffer';
import { endianness } from 'node:os';

const MAGIC = 'trstate1';
const TYPES = { f64: Float64Array, f32: Float32Array, i32: Int32Array, u32: Uint32Array, u8: Uint8Array } as const;
type TypeName = keyof typeof TYPES;
type Typed = InstanceType<(typeof TYPES)[TypeName]>;

function typeName(v: unknown): TypeName | null {
  for (const [name, T] of Object.entries(TYPES)) if (v instanceof T) return name as TypeName;
  return null;
}

const pad8 = (n: number) => (n + 7) & ~7;

/** The state as bytes (typed arrays of the kinds in TYPES; any other value as JSON gives it). */
export function encodeState(state: unknown): Buffer {
  // The bytes are the machine's own; a big-endian machine would read a state of another wrongly.
  if (endianness() !== 'LE') throw new Error('stored model states need a little-endian machine');
  const arrays: Typed[] = [];
  let at = 0;
  const json = JSON.stringify(state, (_key, v: unknown) => {
    const t = typeName(v);
    if (!t) return v;
    const a = v as Typed;
    const ref = { $bytes: [t, at, a.length] };
    arrays.push(a);
    at = pad8(at + a.byteLength);
    return ref;
  });
  const text = Buffer.from(json, 'utf8');
  const head = pad8(MAGIC.length + 4 + text.length);
  const out = Buffer.alloc(head + at);
  out.write(MAGIC, 0, 'latin1');
  out.writeUInt32LE(text.length, MAGIC.length);
  text.copy(out, MAGIC.length + 4);
  let off = head;
  for (const a of arrays) {
    out.set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength), off);
    off = pad8(off + a.byteLength);
  }
  return out;
}

/**
 * The state encodeState gave; throws on bytes it did not write. Its arrays may be views of the
 * bytes (do not reuse the bytes for anything else).
 */
export function decodeState<T>(bytes: Buffer): T {
  if (endianness() !== 'LE') throw new Error('stored model states need a little-endian machine');
  if (bytes.length < MAGIC.length + 4 || bytes.toString('latin1', 0, MAGIC.length) !== MAGIC) throw new Error('not a stored model state');
  const len = bytes.readUInt32LE(MAGIC.length);
  const start = MAGIC.length + 4;
  if (start + len > bytes.length) throw new Error('a stored model state cut short');
  const base = pad8(start + len);
  return JSON.parse(bytes.toString('utf8', start, start + len), (_key, v: unknown) => {
    if (!v || typeof v !== 'object' || !('$bytes' in v)) return v;
    const [t, off, n] = (v as { $bytes: [TypeName, number, number] }).$bytes;
    const T = TYPES[t];
    if (!T) throw new Error(`a stored model state with an array of unknown type ${String(t)}`);
    const from = base + off;
    const size = n * T.BYTES_PER_ELEMENT;
    if (from + size > bytes.length) throw new Error('a stored model state cut short');
    // A view of the bytes where they are aligned for the type (no second copy of a large
    // state), else a copy.
    const at = bytes.byteOffset + from;
    if (at % T.BYTES_PER_ELEMENT === 0) return new T(bytes.buffer as ArrayBuffer, at, n);
    const a = new T(n);
    new Uint8Array(a.buffer).set(bytes.subarray(from, from + size));
    return a;
  }) as T;
}
