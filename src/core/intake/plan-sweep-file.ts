import type { FittedResult } from '../fit/definitions';
import { fitCurveFamily } from '../fit/fit-curve-family';
import type { Channel } from '../jfet-model';
import { parseSweepFile, type ParsedSweepFile, type SweepCurve, type SweepNote } from '../sweep-file';
import { IngestRejection } from './ingest-rejection';
import { readFileHints } from './read-file-hints';

/**
 * The intake's decisions for one sweep file, without a database: which device type it is,
 * which lot each part joins, the conditions recorded with each sweep, and the fit. The
 * service (src/lib/server/services/intake) loads the catalogue, calls these, and stores.
 */

/** What the uploader said for files that do not say (the upload's tags). */
export interface IntakeTags {
  lot?: string;
  device_type?: string;
  temperature_c?: number;
  station?: string;
  operator?: string;
  channel?: Channel;
}

export interface DeviceTypeInfo {
  id: number;
  name: string;
  channel: Channel;
  vdsTestV: number;
}

export interface LotInfo {
  id: number;
  deviceTypeId: number;
}

/** A parser note as kept in sweep.metadata.notes and shown with the upload and on the part page. */
export interface SweepNoteJson {
  code: SweepNote['code'];
  vgs_v: number | null;
  lines: number[];
  message: string;
}

/** One part of a file, decided and fitted, ready to store. */
export interface PlannedPart {
  serial: string;
  indexInFile: number;
  lotId: number | null;
  temperatureC: number | null;
  station: string | null;
  operator: string | null;
  metadata: Record<string, unknown>;
  curves: SweepCurve[];
  pointCount: number;
  fit: FittedResult;
}

/**
 * Decides the file's device type (its `# device type:` line, else the upload's tag; case-
 * insensitive among `typesByName`, keyed lower-case), checks that the channels the file and
 * the upload declare agree with it, and parses the file for that type's channel. Throws
 * `IngestRejection` or the parser's `SweepFileError`; a file without any type that is
 * unreadable anyway gets the parser's reason, the more useful one.
 */
export function readSweepForType<T extends DeviceTypeInfo>(input: {
  text: string;
  byteLength: number;
  fileName: string;
  tags: IntakeTags;
  typesByName: ReadonlyMap<string, T>;
}): { type: T; parsed: ParsedSweepFile } {
  const { text, byteLength, fileName, tags, typesByName } = input;
  const hints = readFileHints(text);
  const typeName = hints.deviceType ?? tags.device_type;
  const known = [...typesByName.values()].map((t) => t.name).sort().join(', ') || 'none yet';
  if (!typeName) {
    parseSweepFile({ text, fileName, byteLength, ...(tags.channel ? { channel: tags.channel } : {}) });
    throw new IngestRejection('no_device_type', { file: fileName, known });
  }
  const type = typesByName.get(typeName.toLowerCase());
  if (!type) {
    throw new IngestRejection('unknown_device_type', { file: fileName, typeName, known });
  }
  for (const [declared, where] of [
    [hints.channel, 'the file'],
    [tags.channel, 'the upload'],
  ] as const) {
    if (declared && declared !== type.channel) {
      throw new IngestRejection('channel_conflict', { file: fileName, where, declared, typeName: type.name, typeChannel: type.channel });
    }
  }
  return { type, parsed: parseSweepFile({ text, fileName, byteLength, channel: type.channel }) };
}

/** The lot codes the file's parts name (a `# lot:` line, else the upload's tag). */
export function lotCodesOf(parsed: ParsedSweepFile, tags: IntakeTags): string[] {
  const codes = new Set<string>();
  for (const p of parsed.parts) {
    const code = p.metadata.lot ?? tags.lot;
    if (code) codes.add(code);
  }
  return [...codes];
}

/**
 * Each part's lot (which must exist and be of the file's type), conditions (the file wins
 * over the upload's tags; the station falls back to `defaultStation`), stored metadata, and
 * fit. Throws `IngestRejection` for an unknown or mismatched lot and for a part no fit can
 * read, refusing the whole file.
 */
export function planParts(input: {
  parsed: ParsedSweepFile;
  type: DeviceTypeInfo;
  fileName: string;
  tags: IntakeTags;
  defaultStation: string | null;
  lotsByCode: ReadonlyMap<string, LotInfo>;
}): PlannedPart[] {
  const { parsed, type, fileName, tags, defaultStation, lotsByCode } = input;
  return parsed.parts.map((p, indexInFile) => {
    const lotCode = p.metadata.lot ?? tags.lot;
    let lotId: number | null = null;
    if (lotCode) {
      const lot = lotsByCode.get(lotCode);
      if (!lot) throw new IngestRejection('unknown_lot', { file: fileName, lot: lotCode, serial: p.serial });
      if (lot.deviceTypeId !== type.id) {
        throw new IngestRejection('type_conflict', { file: fileName, lot: lotCode, typeName: type.name });
      }
      lotId = lot.id;
    }
    const temperatureC = p.metadata.temperatureC ?? tags.temperature_c ?? null;
    const result = fitCurveFamily(
      { curves: p.curves.map((c) => ({ vgsV: c.vgsV, points: { vdsV: c.points.vdsV, idA: c.points.idA } })) },
      { vdsTestV: type.vdsTestV, ...(temperatureC !== null ? { temperatureC } : {}) },
    );
    if (result.status !== 'fitted') {
      throw new IngestRejection('not_fittable', { file: fileName, serial: p.serial, flags: result.flags.map((f) => f.message) });
    }
    return {
      serial: p.serial,
      indexInFile,
      lotId,
      temperatureC,
      station: p.metadata.station ?? defaultStation,
      operator: p.metadata.operator ?? tags.operator ?? null,
      metadata: {
        file_name: fileName,
        format: parsed.format,
        sign_convention: parsed.signConvention,
        channel_source: parsed.channelSource ?? null,
        serial_source: p.serialSource,
        lot: lotCode ?? null,
        sweep_kind: p.kind,
        notes: p.notes.map(toSweepNoteJson),
        extra: p.metadata.extra,
      },
      curves: p.curves,
      pointCount: p.curves.reduce((s, c) => s + c.points.vdsV.length, 0),
      fit: result,
    };
  });
}

function toSweepNoteJson(n: SweepNote): SweepNoteJson {
  return { code: n.code, vgs_v: n.vgsV ?? null, lines: n.lines.slice(0, 50), message: n.message };
}
