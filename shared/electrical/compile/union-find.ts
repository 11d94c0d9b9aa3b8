/** Disjoint sets over string keys; the representative of a set is its earliest-added member. */
export class UnionFind {
  private parent = new Map<string, string>();
  private order = new Map<string, number>();

  add(x: string): void {
    if (!this.parent.has(x)) {
      this.parent.set(x, x);
      this.order.set(x, this.order.size);
    }
  }

  find(x: string): string {
    this.add(x);
    let root = x;
    while (this.parent.get(root) !== root) root = this.parent.get(root)!;
    let cur = x;
    while (cur !== root) {
      const next = this.parent.get(cur)!;
      this.parent.set(cur, root);
      cur = next;
    }
    return root;
  }

  /** Join the sets of a and b; returns false when they were already one set. */
  union(a: string, b: string): boolean {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra === rb) return false;
    if (this.order.get(ra)! <= this.order.get(rb)!) this.parent.set(rb, ra);
    else this.parent.set(ra, rb);
    return true;
  }
}
