// Where a vessel sits in the asset tree, for the element sheets: its code and the stage and train above it.
import type { AssetRecord } from '../db/queries/assets.ts';

export interface Place {
  vessel: string;
  stage: string | null;
  train: string | null;
}

/** Each vessel's place, by asset id: the nearest stage and train among its ancestors. */
export function placesOf(assets: readonly AssetRecord[]): Map<number, Place> {
  const byId = new Map(assets.map((a) => [a.id, a]));
  const out = new Map<number, Place>();
  for (const a of assets) {
    if (a.kind !== 'vessel') continue;
    let stage: string | null = null;
    let train: string | null = null;
    const seen = new Set<number>();
    for (let p = a.parentId === null ? undefined : byId.get(a.parentId); p && !seen.has(p.id); p = p.parentId === null ? undefined : byId.get(p.parentId)) {
      seen.add(p.id);
      if (p.kind === 'stage' && stage === null) stage = p.code;
      if (p.kind === 'train' && train === null) train = p.code;
    }
    out.set(a.id, { vessel: a.code, stage, train });
  }
  return out;
}
