//! Collects warnings while layers are read. A 50 MB layer can repeat one problem on every
//! feature, so each kind is listed for its first few features and then counted in a summary.

use crate::error::{LayerName, Location, Warning};

/// How many warnings of one kind in one layer are listed one by one.
pub const LISTED_PER_KIND: usize = 20;

/// Warnings in the order they arose, with per-kind caps and quiet counters.
#[derive(Debug, Default)]
pub struct Warnings {
    list: Vec<Warning>,
    /// Warnings seen per (layer, kind), in order of first appearance (few kinds: a list).
    seen: Vec<(LayerName, &'static str, usize)>,
    /// Features skipped on purpose (not walkable, not a crossing), counted per reason.
    skipped: Vec<(LayerName, String, usize)>,
}

impl Warnings {
    /// Adds a warning of `kind` (a short stable key, e.g. `"class"`), listing it only while
    /// fewer than [`LISTED_PER_KIND`] of that kind were seen in that layer.
    pub fn push(&mut self, kind: &'static str, at: Location, message: impl Into<String>) {
        let n = match self
            .seen
            .iter_mut()
            .find(|(l, k, _)| *l == at.layer && *k == kind)
        {
            Some((_, _, n)) => {
                *n += 1;
                *n
            }
            None => {
                self.seen.push((at.layer, kind, 1));
                1
            }
        };
        if n <= LISTED_PER_KIND {
            let message: String = message.into();
            self.list.push(Warning {
                at,
                message: super::text::clip(&message, 4 * crate::error::MAX_SHOWN).into_owned(),
            });
        }
    }

    /// Counts a feature skipped quietly for `reason`; one summary per reason at the end.
    pub fn skip(&mut self, layer: LayerName, reason: impl Into<String>) {
        let reason = reason.into();
        match self
            .skipped
            .iter_mut()
            .find(|(l, r, _)| *l == layer && *r == reason)
        {
            Some((_, _, n)) => *n += 1,
            None => self.skipped.push((layer, reason, 1)),
        }
    }

    /// How many features of `layer` were skipped for any reason.
    pub fn skipped_in(&self, layer: LayerName) -> usize {
        self.skipped
            .iter()
            .filter(|(l, _, _)| *l == layer)
            .map(|(_, _, n)| n)
            .sum()
    }

    /// The reasons features of `layer` were skipped, with their counts, in one line
    /// (`3 features not tagged amenity=school (...)`), for an error that refers to them.
    pub fn skipped_reasons(&self, layer: LayerName) -> String {
        self.skipped
            .iter()
            .filter(|(l, _, _)| *l == layer)
            .map(|(_, r, n)| format!("{n}: {r}"))
            .collect::<Vec<_>>()
            .join("; ")
    }

    /// The listed warnings followed by one summary per capped kind and per skip reason.
    pub fn finish(mut self) -> Vec<Warning> {
        for (layer, kind, n) in &self.seen {
            if *n > LISTED_PER_KIND {
                self.list.push(Warning {
                    at: Location::layer(*layer),
                    message: format!(
                        "{} more '{kind}' warnings like the ones above were not listed ({n} in \
                         all); fix it across the layer or map its values in a mapping file",
                        n - LISTED_PER_KIND,
                    ),
                });
            }
        }
        for (layer, reason, n) in &self.skipped {
            self.list.push(Warning {
                at: Location::layer(*layer),
                message: format!("skipped {n} feature(s): {reason}"),
            });
        }
        self.list
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn caps_a_repeated_kind_and_summarises_it() {
        let mut w = Warnings::default();
        for i in 0..(LISTED_PER_KIND + 5) {
            w.push(
                "class",
                Location::feature(LayerName::Streets, i, None),
                "bad",
            );
        }
        w.push(
            "lanes",
            Location::feature(LayerName::Streets, 0, None),
            "bad",
        );
        w.skip(LayerName::Streets, "not walkable");
        w.skip(LayerName::Streets, "not walkable");
        assert_eq!(w.skipped_in(LayerName::Streets), 2);
        let out = w.finish();
        assert_eq!(out.len(), LISTED_PER_KIND + 1 + 2);
        assert!(out
            .iter()
            .any(|x| x.message.starts_with("5 more 'class' warnings")));
        assert!(out
            .iter()
            .any(|x| x.message == "skipped 2 feature(s): not walkable"));
    }
}

/// The feature being read, for locating messages.
#[derive(Debug, Clone)]
pub struct Ctx {
    pub layer: LayerName,
    pub index: usize,
    pub id: Option<String>,
}

impl Ctx {
    pub fn at(&self) -> Location {
        Location::feature(self.layer, self.index, self.id.clone())
    }
    pub fn at_prop(&self, property: &str) -> Location {
        self.at().with_property(property)
    }
}
