// The asset tree of a site (docs/design.md §6 Failure: an asset's failures are its own and those of every
// asset below it), walked over plain rows: what the KPI services and the report builders both need.

/** What the tree walks need of an asset. */
export interface TreeAsset {
  id: number;
  parentId: number | null;
}

/** The asset and its descendants, parents before children. */
export function subtree<A extends TreeAsset>(assets: readonly A[], root: A): A[] {
  const children = new Map<number, A[]>();
  for (const a of assets) if (a.parentId !== null) (children.get(a.parentId) ?? children.set(a.parentId, []).get(a.parentId)!).push(a);
  const out: A[] = [];
  const walk = (a: A) => {
    out.push(a);
    for (const c of children.get(a.id) ?? []) walk(c);
  };
  walk(root);
  return out;
}

/** The asset, then its parent, and so on up to the root. */
export function ancestry<A extends TreeAsset>(assets: readonly A[], asset: A): A[] {
  const byId = new Map(assets.map((a) => [a.id, a]));
  const out: A[] = [];
  for (let at: A | undefined = asset; at && !out.includes(at); at = at.parentId === null ? undefined : byId.get(at.parentId)) out.push(at);
  return out;
}
