//! A small union-find (disjoint sets) with path halving, for snapping and components.

/// Disjoint sets over `0..n`.
#[derive(Debug, Clone)]
pub(crate) struct UnionFind {
    parent: Vec<u32>,
}

impl UnionFind {
    pub(crate) fn new(n: usize) -> Self {
        UnionFind {
            parent: (0..n as u32).collect(),
        }
    }

    /// The representative of `x`'s set (the smallest index is not guaranteed).
    pub(crate) fn find(&mut self, mut x: u32) -> u32 {
        while let Some(&p) = self.parent.get(x as usize) {
            if p == x {
                break;
            }
            let gp = self.parent.get(p as usize).copied().unwrap_or(p);
            if let Some(slot) = self.parent.get_mut(x as usize) {
                *slot = gp;
            }
            x = gp;
        }
        x
    }

    /// Joins the sets of `a` and `b`; the smaller representative becomes the root, so the
    /// result does not depend on the order of unions.
    pub(crate) fn union(&mut self, a: u32, b: u32) {
        let (ra, rb) = (self.find(a), self.find(b));
        if ra == rb {
            return;
        }
        let (lo, hi) = if ra < rb { (ra, rb) } else { (rb, ra) };
        if let Some(slot) = self.parent.get_mut(hi as usize) {
            *slot = lo;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn joins_transitively_and_keeps_others_apart() {
        let mut u = UnionFind::new(5);
        u.union(3, 1);
        u.union(1, 4);
        assert_eq!(u.find(4), u.find(3));
        assert_ne!(u.find(0), u.find(3));
        assert_ne!(u.find(2), u.find(4));
        assert_eq!(u.find(4), 1);
    }
}
