// The asset tree (docs/design.md §4: a tree per site through `parent`), walked the same way by the
// services that load a scope and by the answer builders that apply its rules.

/** What the tree walks read of an asset: its id and its parent's. */
export interface TreeNode {
  id: number;
  parentId: number | null;
}

/** The asset and its descendants, parents before children. */
export function subtree<A extends TreeNode>(assets: readonly A[], root: A): A[] {
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
export function ancestry<A extends TreeNode>(assets: readonly A[], asset: A): A[] {
  const byId = new Map(assets.map((a) => [a.id, a]));
  const out: A[] = [];
  for (let at: A | undefined = asset; at && !out.includes(at); at = at.parentId === null ? undefined : byId.get(at.parentId)) out.push(at);
  return out;
}
