import type { Channel } from '../jfet-model';
import { readMetadataComment } from '../sweep-file/read-sweep-metadata';

export interface FileHints {
  deviceType?: string;
  channel?: Channel;
}

/**
 * The device type and channel a file names in its `# key: value` lines, read before the full
 * parse: the type decides the channel the parser is told. Unreadable values are left to the
 * parser, which reports them with their line.
 */
export function readFileHints(text: string): FileHints {
  const hints: FileHints = {};
  let start = 0;
  while (start < text.length) {
    let end = text.indexOf('\n', start);
    if (end < 0) end = text.length;
    const line = text.slice(start, end);
    const trimmed = line.trimStart();
    if (trimmed.startsWith('#') || trimmed.startsWith('\ufeff#')) {
      const entry = readMetadataComment(line.replace(/^\ufeff/, '').replace(/\r$/, ''), 0);
      if (entry?.key === 'device_type' && hints.deviceType === undefined) hints.deviceType = entry.value.trim();
      if (entry?.key === 'channel' && hints.channel === undefined) {
        const letters = entry.value.toLowerCase().replace(/[^a-z]/g, '');
        if (['n', 'nchannel', 'njf'].includes(letters)) hints.channel = 'n';
        if (['p', 'pchannel', 'pjf'].includes(letters)) hints.channel = 'p';
      }
    }
    start = end + 1;
  }
  return hints;
}
