// What an accepted file may carry (issue 11, finding 8). A PDF that acts when opened — JavaScript, an
// open action, a launch, embedded files or forms that submit — is refused: a qualification record's
// attachments are documents to read, never programs. An image keeps only its picture: bytes after the
// PNG IEND chunk or the JPEG end-of-image marker (where an HTML or ZIP "polyglot" hides) are cut off.
//
// Every check reads the file as a stream, chunk by chunk, as it goes to the object store: nothing holds
// the whole file in memory. The one-buffer functions at the end run the same code on a single chunk.
import { createInflate, type Inflate } from 'node:zlib';

const ACTIVE_PDF_NAMES = [
  'JavaScript',
  'JS',
  'OpenAction',
  'AA',
  'Launch',
  'EmbeddedFile',
  'RichMedia',
  'SubmitForm',
  'ImportData',
  'GoToR',
  'GoToE',
];
const ACTIVE_PDF = new RegExp(`/(${ACTIVE_PDF_NAMES.join('|')})(?![A-Za-z0-9])`, 'g');
/** Longest name of the list written with every letter as #xx, plus its slash: what a chunk edge may cut. */
const NAME_OVERLAP = 64;
const MAX_INFLATED = 64 * 1024 * 1024;
const EMPTY = Buffer.alloc(0);

/** PDF names may spell letters as #xx; read them as written out. */
const unescapeNames = (s: string) =>
  s.replace(/#([0-9A-Fa-f]{2})/g, (_m, h: string) => String.fromCharCode(parseInt(h, 16)));

/**
 * Finds active PDF names in text that arrives in pieces. A name at the very end of a piece is judged only
 * when what follows it is known (`/JS` may be the start of `/JSON`), so the verdict never depends on
 * where the pieces were cut.
 */
class NameScanner {
  private tail = '';
  hit: string | null = null;

  push(text: string, final = false): void {
    if (this.hit) return;
    const window = unescapeNames(this.tail + text);
    ACTIVE_PDF.lastIndex = 0;
    for (let m = ACTIVE_PDF.exec(window); m; m = ACTIVE_PDF.exec(window)) {
      if (final || m.index + m[0].length < window.length) {
        this.hit = m[1] ?? null;
        return;
      }
    }
    this.tail = (this.tail + text).slice(-NAME_OVERLAP);
  }
}

/** One compressed PDF stream inflated as its bytes arrive, its text searched for active names. */
class InflatingScan {
  private readonly inflate: Inflate = createInflate();
  private readonly names = new NameScanner();
  private failed = false;
  inflated = 0;
  private readonly ended: Promise<void>;

  constructor(private readonly budget: number) {
    this.inflate.on('data', (chunk: Buffer) => {
      this.inflated += chunk.length;
      if (this.inflated > this.budget) {
        this.failed = true;
        this.inflate.destroy();
        return;
      }
      this.names.push(chunk.toString('latin1'));
    });
    this.ended = new Promise((resolve) => {
      this.inflate.on('end', resolve);
      this.inflate.on('close', resolve);
      // Not a Flate stream (an image, or already plain): its raw bytes were searched already.
      this.inflate.on('error', () => {
        this.failed = true;
        resolve();
      });
    });
  }

  get overBudget(): boolean {
    return this.inflated > this.budget;
  }

  async write(bytes: Buffer): Promise<void> {
    if (this.failed || bytes.length === 0) return;
    if (!this.inflate.write(bytes))
      await new Promise<void>((resolve) => {
        this.inflate.once('drain', resolve);
        this.inflate.once('close', resolve);
      });
  }

  /** Ends the stream; the active name found in it, if any. */
  async finish(): Promise<string | null> {
    if (!this.failed) this.inflate.end();
    await this.ended;
    if (!this.failed) this.names.push('', true);
    return this.names.hit;
  }

  discard(): void {
    this.failed = true;
    this.inflate.destroy();
  }
}

/**
 * The active feature a PDF carries, in its plain objects or its compressed streams, read chunk by chunk.
 * Every `stream … endstream` body is inflated (when it is Flate) and searched; the search for the next
 * body starts after the `endstream` keyword, so no body is skipped.
 */
export class PdfScanner {
  private readonly raw = new NameScanner();
  private carry: Buffer = EMPTY;
  private body: InflatingScan | null = null;
  private inflated = 0;
  private hit: string | null = null;

  async push(chunk: Buffer): Promise<void> {
    if (this.hit) return;
    this.raw.push(chunk.toString('latin1'));
    let data = this.carry.length ? Buffer.concat([this.carry, chunk]) : chunk;
    this.carry = EMPTY;
    for (;;) {
      const text = data.toString('latin1');
      if (!this.body) {
        const start = /stream\r?\n/.exec(text);
        if (!start) {
          // Keep what may be the start of "stream\r\n" for the next chunk.
          this.carry = data.subarray(Math.max(0, data.length - 7));
          return;
        }
        this.body = new InflatingScan(MAX_INFLATED - this.inflated);
        data = data.subarray(start.index + start[0].length);
        continue;
      }
      const end = text.indexOf('endstream');
      if (end < 0) {
        // Hold back what may be the start of "endstream".
        const hold = Math.min(8, data.length);
        await this.body.write(data.subarray(0, data.length - hold));
        this.carry = data.subarray(data.length - hold);
        return;
      }
      await this.body.write(data.subarray(0, end));
      const body = this.body;
      this.body = null;
      const found = await body.finish();
      this.inflated += body.inflated;
      if (body.overBudget || this.inflated > MAX_INFLATED) this.hit = 'too much compressed content';
      else if (found) this.hit = found;
      if (this.hit) return;
      data = data.subarray(end + 'endstream'.length);
    }
  }

  /** After the last chunk: the active feature found, or null. */
  end(): Promise<string | null> {
    // A body without its endstream is not read as compressed content (its raw bytes were searched).
    this.body?.discard();
    this.body = null;
    this.raw.push('', true);
    return Promise.resolve(this.hit ?? this.raw.hit);
  }
}

/** Passes a PNG through up to the end of its IEND chunk (with its CRC); all of it when there is no IEND. */
export class PngCutter {
  private offset = 0;
  private nextChunk = 8; // after the signature
  private header: number[] = [];
  private cutAt = Infinity;

  keep(chunk: Buffer): Buffer {
    const start = this.offset;
    this.offset += chunk.length;
    for (let i = 0; i < chunk.length && this.cutAt === Infinity;) {
      const pos = start + i;
      if (pos < this.nextChunk) {
        i += this.nextChunk - pos;
        continue;
      }
      this.header.push(chunk[i]!);
      i += 1;
      if (this.header.length === 8) {
        const h = Buffer.from(this.header);
        this.header = [];
        const length = h.readUInt32BE(0);
        this.nextChunk = pos + 1 + length + 4; // the data and its CRC follow the type
        if (h.toString('latin1', 4, 8) === 'IEND') this.cutAt = this.nextChunk;
      }
    }
    if (this.cutAt >= this.offset) return chunk;
    return chunk.subarray(0, Math.max(0, this.cutAt - start));
  }
}

/**
 * Passes a JPEG through up to its end-of-image marker, found by walking the marker segments and the
 * entropy-coded scan data (where 0xFF is followed by 0x00 or a restart marker), so a thumbnail's EOI
 * inside APP1 does not cut the picture short. Anything that is not a JPEG's structure passes whole.
 */
export class JpegCutter {
  private offset = 0;
  private state: 'soi' | 'ff' | 'marker' | 'len1' | 'len2' | 'skip' | 'scan' | 'scanff' | 'whole' | 'cut' =
    'soi';
  private marker = 0;
  private length = 0;
  private skip = 2; // the SOI marker
  private cutAt = Infinity;

  private onMarker(b: number, at: number): void {
    if (b === 0xd9) {
      this.cutAt = at + 1;
      this.state = 'cut';
    } else if (b === 0xff) this.state = 'marker';
    else if (b === 0x01 || (b >= 0xd0 && b <= 0xd7)) this.state = 'ff';
    else {
      this.marker = b;
      this.state = 'len1';
    }
  }

  keep(chunk: Buffer): Buffer {
    const start = this.offset;
    this.offset += chunk.length;
    for (let i = 0; i < chunk.length; i++) {
      const b = chunk[i]!;
      switch (this.state) {
        case 'soi':
          if (--this.skip === 0) this.state = 'ff';
          break;
        case 'ff':
          this.state = b === 0xff ? 'marker' : 'whole';
          break;
        case 'scanff':
          // A byte other than a stuffed zero or a restart marker ends the scan data: it is a marker.
          if (b === 0x00 || (b >= 0xd0 && b <= 0xd7)) this.state = 'scan';
          else this.onMarker(b, start + i);
          break;
        case 'marker':
          this.onMarker(b, start + i);
          break;
        case 'len1':
          this.length = b << 8;
          this.state = 'len2';
          break;
        case 'len2':
          this.length |= b;
          if (this.length < 2) this.state = 'whole';
          else {
            this.skip = this.length - 2;
            this.state = this.skip > 0 ? 'skip' : this.marker === 0xda ? 'scan' : 'ff';
          }
          break;
        case 'skip': {
          const n = Math.min(this.skip, chunk.length - i);
          this.skip -= n;
          i += n - 1;
          if (this.skip === 0) this.state = this.marker === 0xda ? 'scan' : 'ff';
          break;
        }
        case 'scan': {
          const ff = chunk.indexOf(0xff, i);
          if (ff < 0) i = chunk.length;
          else {
            i = ff;
            this.state = 'scanff';
          }
          break;
        }
        case 'whole':
        case 'cut':
          i = chunk.length;
          break;
      }
    }
    if (this.cutAt >= this.offset) return chunk;
    return chunk.subarray(0, Math.max(0, this.cutAt - start));
  }
}

/** The cutter of an image type, or null when the type keeps every byte. */
export function imageCutter(contentType: string): PngCutter | JpegCutter | null {
  if (contentType === 'image/png') return new PngCutter();
  if (contentType === 'image/jpeg') return new JpegCutter();
  return null;
}

// ---- the same checks on a whole buffer ---------------------------------------------------------------

export async function activePdfContent(pdf: Buffer): Promise<string | null> {
  const scanner = new PdfScanner();
  await scanner.push(pdf);
  return scanner.end();
}

export const pngWithoutTrailer = (png: Buffer): Buffer => new PngCutter().keep(png);
export const jpegWithoutTrailer = (jpg: Buffer): Buffer => new JpegCutter().keep(jpg);
