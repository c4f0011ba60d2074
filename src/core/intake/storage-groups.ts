/** What decides whether two planned files may be stored in one transaction. */
export interface StorageKey {
  /** One uploader per group: the audit names one actor. */
  actorKey: string;
  sha256: string;
  serials: readonly string[];
}

/**
 * Splits planned files into groups stored one transaction each, in order: one uploader per
 * group, and no serial or SHA-256 twice in a group, so that a retest in the same batch lands
 * after the sweep it follows. A file joins the earliest group of its uploader that it does
 * not clash with, but never ahead of a group that already holds one of its serials or bytes.
 */
export function storageGroups<T extends StorageKey>(planned: readonly T[]): T[][] {
  const groups: { actorKey: string; serials: Set<string>; shas: Set<string>; files: T[] }[] = [];
  for (const f of planned) {
    let at = groups.length;
    for (let i = groups.length - 1; i >= 0; i--) {
      const g = groups[i];
      const clashes = g.shas.has(f.sha256) || f.serials.some((s) => g.serials.has(s));
      if (clashes) break;
      if (g.actorKey === f.actorKey) at = i;
    }
    if (at === groups.length) groups.push({ actorKey: f.actorKey, serials: new Set(), shas: new Set(), files: [] });
    const g = groups[at];
    g.files.push(f);
    g.shas.add(f.sha256);
    for (const s of f.serials) g.serials.add(s);
  }
  return groups.map((g) => g.files);
}
