/**
 * Disjoint sets over string keys; the representative of a set is its earliest-added member. Keys are
 * numbered in order of addition (one Map), the forest is an array of those numbers.
 */
export class UnionFind {
  private index = new Map<string, number>();
  private names: string[] = [];
  private parent: number[] = [];

  add(x: string): void {
    this.slot(x);
  }

  find(x: string): string {
    return this.names[this.root(this.slot(x))];
  }

  /** Join the sets of a and b; returns false when they were already one set. */
  union(a: string, b: string): boolean {
    const ra = this.root(this.slot(a));
    const rb = this.root(this.slot(b));
    if (ra === rb) return false;
    // The earlier-added root stays the representative.
    if (ra < rb) this.parent[rb] = ra;
    else this.parent[ra] = rb;
    return true;
  }

  private slot(x: string): number {
    let i = this.index.get(x);
    if (i === undefined) {
      i = this.names.length;
      this.index.set(x, i);
      this.names.push(x);
      this.parent.push(i);
    }
    return i;
  }

  private root(i: number): number {
    const p = this.parent;
    let r = i;
    while (p[r] !== r) r = p[r];
    while (p[i] !== r) {
      const next = p[i];
      p[i] = r;
      i = next;
    }
    return r;
  }
}
