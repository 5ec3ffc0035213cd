//! Saving over a user's file without losing what they wrote there.
//!
//! The writers (`BoatDoc::to_toml`, `EngineDoc::to_toml`) stay the one canonical form of a
//! document. At save time that canonical text is merged into the file's current text with
//! `toml_edit`, so that comments, key order, blank lines and the way each unchanged value is
//! written survive; only what changed changes.
//!
//! The merge walks both trees: tables are recursed; a leaf value that is equal (as a TOML value)
//! is kept with its decor and comment, a changed one is replaced in place (the key's leading
//! comment and the value's trailing one stay); keys the writer no longer writes are removed and
//! new ones are placed after their canonical predecessor; arrays of tables are matched by
//! `label` when every table has one (`[[variant]]`), else by position (`[[trial.run]]`).
//!
//! Every structural change the merge makes (a replaced value, a removed or an added key, table
//! or array element) is an *edit*. The writer omits what is a default (`method = "auto"`,
//! `reynolds_correction = true`) and writes some values in one form only (a gear written
//! `"2.5:1"` becomes `2.5`): such edits change nothing the reader sees, so each edit is undone
//! again, one at a time, when the text without it still reads back to the same document. The
//! reader decides: a merged text is kept only when it reads back to the document the canonical
//! text holds; otherwise the canonical text is saved, so a save never loses data.

use std::collections::{HashMap, HashSet};
use toml_edit::{ArrayOfTables, DocumentMut, InlineTable, Item, Key, Table, TableLike, Value};

/// Most edits that are each tried for being unneeded (each try reads the file once): far more
/// than one save changes, few enough that a file written in a very different style still saves
/// at once.
const MAX_UNDO_TRIES: usize = 256;

/// The text to save: `canonical` (the writer's text of the document) merged into `previous`
/// (the file's current text; `None` for a new file). `same(text)` says whether `text` reads
/// back to the document `canonical` holds; when the merge does not, `canonical` is returned.
pub fn merge_into(previous: Option<&str>, canonical: &str, same: impl Fn(&str) -> bool) -> String {
    let Some(previous) = previous else {
        return canonical.to_owned();
    };
    let (Ok(old), Ok(new)) = (
        previous.parse::<DocumentMut>(),
        canonical.parse::<DocumentMut>(),
    ) else {
        return canonical.to_owned();
    };
    let mut undone = HashSet::new();
    let (mut best, edits) = merged(&old, &new, &undone);
    if edits == 0 {
        // Nothing differs as a TOML value: the user's text is the document.
        return if same(previous) {
            previous.to_owned()
        } else {
            canonical.to_owned()
        };
    }
    if !same(&best) {
        return canonical.to_owned();
    }
    for edit in 0..edits.min(MAX_UNDO_TRIES) {
        undone.insert(edit);
        let (text, _) = merged(&old, &new, &undone);
        if same(&text) {
            best = text;
        } else {
            undone.remove(&edit);
        }
    }
    best
}

/// `new` merged into a copy of `old` with the edits in `undone` left out: the text and how many
/// edits the merge found (the same count whatever is undone, so that edits keep their numbers).
fn merged(old: &DocumentMut, new: &DocumentMut, undone: &HashSet<usize>) -> (String, usize) {
    let mut doc = old.clone();
    let mut merge = Merge { undone, next: 0 };
    merge.standard_table(doc.as_table_mut(), new.as_table());
    (doc.to_string(), merge.next)
}

/// One pass of the merge: numbers the edits in the order it meets them.
struct Merge<'a> {
    undone: &'a HashSet<usize>,
    next: usize,
}

impl Merge<'_> {
    /// Takes the next edit's number; whether to carry it out.
    fn apply(&mut self) -> bool {
        let id = self.next;
        self.next += 1;
        !self.undone.contains(&id)
    }

    /// Merges into a `[table]` (or the root) and puts keys it added in canonical order.
    fn standard_table(&mut self, old: &mut Table, new: &dyn TableLike) {
        let added = self.table(old, new);
        if !added.is_empty() {
            let rank = ranks(old.iter().map(|(k, _)| k), new, &added);
            old.sort_values_by(|a, _, b, _| rank_of(&rank, a).cmp(&rank_of(&rank, b)));
        }
    }

    /// Merges into an inline table, as [`Merge::standard_table`] does.
    fn inline_table(&mut self, old: &mut InlineTable, new: &dyn TableLike) {
        let added = self.table(old, new);
        if !added.is_empty() {
            let rank = ranks(old.iter().map(|(k, _)| k), new, &added);
            old.sort_values_by(|a, _, b, _| rank_of(&rank, a).cmp(&rank_of(&rank, b)));
        }
    }

    /// Merges the keys of `new` into `old`: the keys it added.
    fn table(&mut self, old: &mut dyn TableLike, new: &dyn TableLike) -> HashSet<String> {
        let gone: Vec<String> = old
            .iter()
            .map(|(k, _)| k.to_owned())
            .filter(|k| !new.contains_key(k))
            .collect();
        for key in gone {
            if self.apply() {
                old.remove(&key);
            }
        }
        let mut added = HashSet::new();
        for (key, item) in new.iter() {
            match old.get_mut(key) {
                Some(existing) => self.item(existing, item),
                None => {
                    if self.apply() {
                        old.insert(key, fresh(item));
                        added.insert(key.to_owned());
                    }
                }
            }
        }
        added
    }

    /// Merges one item: tables recursed, arrays of tables matched, values compared.
    fn item(&mut self, old: &mut Item, new: &Item) {
        if let (Item::ArrayOfTables(o), Item::ArrayOfTables(n)) = (&mut *old, new) {
            self.tables(o, n);
            return;
        }
        if let Some(n) = new.as_table_like() {
            if let Some(o) = old.as_table_mut() {
                self.standard_table(o, n);
                return;
            }
            if let Some(o) = old.as_inline_table_mut() {
                self.inline_table(o, n);
                return;
            }
        }
        if let (Item::Value(o), Item::Value(n)) = (&mut *old, new) {
            self.value(o, n);
            return;
        }
        if self.apply() {
            *old = fresh(new);
        }
    }

    /// Merges one value: arrays of the same length element by element, inline tables key by
    /// key, anything else replaced when it differs, keeping the old value's decor (its spacing
    /// and trailing comment).
    fn value(&mut self, old: &mut Value, new: &Value) {
        match (&mut *old, new) {
            (Value::Array(o), Value::Array(n)) if o.len() == n.len() => {
                for (i, n) in n.iter().enumerate() {
                    if let Some(o) = o.get_mut(i) {
                        self.value(o, n);
                    }
                }
            }
            (Value::InlineTable(o), Value::InlineTable(n)) => self.inline_table(o, n),
            (o, n) => {
                if !same_value(o, n) && self.apply() {
                    let decor = o.decor().clone();
                    *o = n.clone();
                    *o.decor_mut() = decor;
                }
            }
        }
    }

    /// Merges an array of tables: `[[variant]]` tables by label (when every table on both sides
    /// has one), then the rest by position; unmatched new tables are added, unmatched old ones
    /// removed. The result is in the canonical order.
    fn tables(&mut self, old: &mut ArrayOfTables, new: &ArrayOfTables) {
        let label = |t: &Table| t.get("label").and_then(Item::as_str).map(str::to_owned);
        let by_label = new.iter().chain(old.iter()).all(|t| label(t).is_some());
        let mut olds: Vec<Option<Table>> = old.iter().cloned().map(Some).collect();
        let mut partner: Vec<Option<usize>> = vec![None; new.len()];
        if by_label {
            for (i, n) in new.iter().enumerate() {
                let found = olds.iter().enumerate().position(|(j, o)| {
                    o.as_ref().is_some_and(|o| label(o) == label(n)) && !partner.contains(&Some(j))
                });
                partner[i] = found;
            }
        }
        for i in 0..new.len() {
            if partner[i].is_none() && i < olds.len() && !partner.contains(&Some(i)) {
                partner[i] = Some(i);
            }
        }
        let mut result = ArrayOfTables::new();
        for (n, partner) in new.iter().zip(&partner) {
            match partner.and_then(|j| olds[j].take()) {
                Some(mut o) => {
                    self.standard_table(&mut o, n);
                    result.push(o);
                }
                None => {
                    if self.apply() {
                        result.push(fresh_table(n));
                    }
                }
            }
        }
        for o in olds.into_iter().flatten() {
            if !self.apply() {
                result.push(o);
            }
        }
        // Tables are printed by their place in the file: give the kept ones their places again
        // in the new order (a table added has none and follows the one before it).
        let mut places: Vec<isize> = result.iter().filter_map(Table::position).collect();
        places.sort_unstable();
        let mut places = places.into_iter();
        for t in result.iter_mut() {
            if t.position().is_some()
                && let Some(p) = places.next()
            {
                t.set_position(p);
            }
        }
        *old = result;
    }
}

/// Where each key of a merged table goes: the keys it had keep their order, each added key
/// follows the nearest key before it in canonical order (at the front when there is none).
fn ranks<'k>(
    present: impl Iterator<Item = &'k str>,
    new: &dyn TableLike,
    added: &HashSet<String>,
) -> HashMap<String, usize> {
    let mut order: Vec<String> = present
        .filter(|k| !added.contains(*k))
        .map(str::to_owned)
        .collect();
    let mut at = 0;
    for (key, _) in new.iter() {
        if added.contains(key) {
            order.insert(at, key.to_owned());
            at += 1;
        } else if let Some(i) = order.iter().position(|k| k == key) {
            at = i + 1;
        }
    }
    order.into_iter().enumerate().map(|(i, k)| (k, i)).collect()
}

/// The place of `key` in `rank`; keys it does not know (those of dotted sub-tables) keep theirs.
fn rank_of(rank: &HashMap<String, usize>, key: &Key) -> usize {
    rank.get(key.get()).copied().unwrap_or(usize::MAX)
}

/// Whether two values are the same TOML value, however they are written.
fn same_value(a: &Value, b: &Value) -> bool {
    match (a, b) {
        (Value::String(x), Value::String(y)) => x.value() == y.value(),
        (Value::Integer(x), Value::Integer(y)) => x.value() == y.value(),
        (Value::Float(x), Value::Float(y)) => x.value().to_bits() == y.value().to_bits(),
        (Value::Boolean(x), Value::Boolean(y)) => x.value() == y.value(),
        (Value::Datetime(x), Value::Datetime(y)) => x.value() == y.value(),
        (Value::Array(x), Value::Array(y)) => {
            x.len() == y.len() && x.iter().zip(y.iter()).all(|(a, b)| same_value(a, b))
        }
        (Value::InlineTable(x), Value::InlineTable(y)) => {
            x.len() == y.len()
                && x.iter()
                    .all(|(k, a)| y.get(k).is_some_and(|b| same_value(a, b)))
        }
        _ => false,
    }
}

/// A copy of a canonical item to add to the user's file: no place of its own (it follows what
/// comes before it) and the default spacing around a value.
fn fresh(item: &Item) -> Item {
    match item {
        Item::Table(t) => Item::Table(fresh_table(t)),
        Item::ArrayOfTables(a) => {
            let mut out = ArrayOfTables::new();
            for t in a.iter() {
                out.push(fresh_table(t));
            }
            Item::ArrayOfTables(out)
        }
        Item::Value(v) => {
            let mut v = v.clone();
            v.decor_mut().clear();
            Item::Value(v)
        }
        Item::None => Item::None,
    }
}

/// [`fresh`] for a table: its keys, header decor and kind, without its canonical place.
fn fresh_table(t: &Table) -> Table {
    let mut out = Table::new();
    for (k, v) in t.iter() {
        out.insert(k, fresh(v));
    }
    out.set_implicit(t.is_implicit());
    out.set_dotted(t.is_dotted());
    *out.decor_mut() = t.decor().clone();
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Both texts parse to the same TOML data (what the merge must keep).
    fn same_data(a: &str, b: &str) -> bool {
        a.parse::<toml::Table>().ok() == b.parse::<toml::Table>().ok()
    }

    fn merge(old: &str, new: &str) -> String {
        merge_into(Some(old), new, |t| same_data(t, new))
    }

    #[test]
    fn a_changed_value_keeps_its_comments() {
        let old = "# head\na = 1 # one\n\n# about b\nb = \"x\"   # the b\n";
        let new = "a = 1\nb = \"y\"\n";
        assert_eq!(
            merge(old, new),
            "# head\na = 1 # one\n\n# about b\nb = \"y\"   # the b\n"
        );
    }

    #[test]
    fn a_key_gone_is_removed_and_a_new_one_follows_its_predecessor() {
        let old = "a = 1 # a\nc = 3 # c\n\n[t]\nx = 1\n";
        let new = "a = 1\nb = 2\n\n[t]\nx = 1\n";
        assert_eq!(merge(old, new), "a = 1 # a\nb = 2\n\n[t]\nx = 1\n");
    }

    #[test]
    fn a_new_table_follows_its_canonical_predecessor() {
        let old = "[a]\nx = 1 # a\n\n[c]\nz = 3 # c\n";
        let new = "[a]\nx = 1\n\n[b]\ny = 2\n\n[c]\nz = 3\n";
        assert_eq!(
            merge(old, new),
            "[a]\nx = 1 # a\n\n[b]\ny = 2\n\n[c]\nz = 3 # c\n"
        );
    }

    #[test]
    fn labelled_tables_are_matched_by_label() {
        let old = "[[v]]\nlabel = \"a\" # first\nn = 1\n\n[[v]]\nlabel = \"b\" # second\nn = 2\n";
        let new = "[[v]]\nlabel = \"b\"\nn = 3\n\n[[v]]\nlabel = \"c\"\nn = 4\n";
        let out = merge(old, new);
        assert!(same_data(&out, new), "{out}");
        assert!(out.contains("label = \"b\" # second\nn = 3"), "{out}");
        assert!(!out.contains("# first"), "{out}");
    }

    #[test]
    fn an_unparsable_old_text_gives_the_canonical_one() {
        assert_eq!(merge("a = = 1", "a = 2\n"), "a = 2\n");
    }

    #[test]
    fn a_merge_the_reader_refuses_gives_the_canonical_text() {
        let out = merge_into(Some("a = 1 # keep\n"), "a = 2\n", |t| t == "a = 2\n");
        assert_eq!(out, "a = 2\n");
    }

    #[test]
    fn an_edit_the_reader_does_not_see_is_undone() {
        // The reader takes b = 0 for a missing b: the merge keeps the user's line.
        let old = "a = 1\nb = 0 # default\n";
        let new = "a = 2\n";
        let reads = |t: &str| {
            let table: toml::Table = t.parse().unwrap();
            let b = table.get("b").and_then(|b| b.as_integer()).unwrap_or(0);
            (table.get("a").cloned(), b)
        };
        let out = merge_into(Some(old), new, |t| reads(t) == reads(new));
        assert_eq!(out, "a = 2\nb = 0 # default\n");
    }
}
