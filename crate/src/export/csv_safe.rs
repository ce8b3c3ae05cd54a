//! Every CSV cell we write passes through [`safe_cell`]: a text cell that a spreadsheet would
//! read as a formula (starting with `=`, `+`, `-`, `@`, a tab or a carriage return) gets a
//! leading apostrophe, as the OWASP "CSV Injection" guidance advises; numbers such as `-3.5`
//! stay numbers. The csv crate does the RFC 4180 quoting.

use std::borrow::Cow;

/// Whether `s` is a plain decimal number (`-3.5`, `+1e-3`, `12`), which stays as it is.
fn is_plain_number(s: &str) -> bool {
    let b = s.as_bytes();
    let mut i = usize::from(matches!(b.first(), Some(b'+' | b'-')));
    let digits_start = i;
    while b.get(i).is_some_and(u8::is_ascii_digit) {
        i += 1;
    }
    let mut digits = i - digits_start;
    if b.get(i) == Some(&b'.') {
        i += 1;
        let f = i;
        while b.get(i).is_some_and(u8::is_ascii_digit) {
            i += 1;
        }
        digits += i - f;
    }
    if digits == 0 {
        return false;
    }
    if matches!(b.get(i), Some(b'e' | b'E')) {
        i += 1;
        if matches!(b.get(i), Some(b'+' | b'-')) {
            i += 1;
        }
        let e = i;
        while b.get(i).is_some_and(u8::is_ascii_digit) {
            i += 1;
        }
        if i == e {
            return false;
        }
    }
    i == b.len()
}

/// A cell as it is safe to write: formula-like text gets a leading `'`.
///
/// ```
/// use catchwalk::export::csv_safe::safe_cell;
/// assert_eq!(safe_cell("=HYPERLINK(\"x\")"), "'=HYPERLINK(\"x\")");
/// assert_eq!(safe_cell("@SUM(A1)"), "'@SUM(A1)");
/// assert_eq!(safe_cell("-3.5"), "-3.5");
/// assert_eq!(safe_cell("Elm Street"), "Elm Street");
/// ```
pub fn safe_cell(cell: &str) -> Cow<'_, str> {
    let risky = matches!(
        cell.as_bytes().first(),
        Some(b'=' | b'+' | b'-' | b'@' | b'\t' | b'\r')
    );
    if risky && !is_plain_number(cell) {
        Cow::Owned(format!("'{cell}"))
    } else {
        Cow::Borrowed(cell)
    }
}

/// Writes one record with every cell made safe (a failed write into memory cannot happen).
pub fn write_row<I, T>(w: &mut csv::Writer<Vec<u8>>, row: I)
where
    I: IntoIterator<Item = T>,
    T: AsRef<str>,
{
    let cells: Vec<String> = row
        .into_iter()
        .map(|c| safe_cell(c.as_ref()).into_owned())
        .collect();
    let _ = w.write_record(&cells);
}

/// [`write_row`] as a method of the writer: `w.safe_row([...])`.
pub trait SafeRow {
    fn safe_row<I, T>(&mut self, row: I)
    where
        I: IntoIterator<Item = T>,
        T: AsRef<str>;
}

impl SafeRow for csv::Writer<Vec<u8>> {
    fn safe_row<I, T>(&mut self, row: I)
    where
        I: IntoIterator<Item = T>,
        T: AsRef<str>,
    {
        write_row(self, row);
    }
}

/// The CSV text of a writer into memory: RFC 4180, header first, nothing before it.
pub fn csv_text(w: csv::Writer<Vec<u8>>) -> String {
    String::from_utf8(w.into_inner().unwrap_or_default()).unwrap_or_default()
}

/// The CSV text of `n` records after `header`, record `i` given by `row(i)`. Natively the
/// records are written in blocks on every core and joined in order, so the text is the same
/// on any number of threads (each record is quoted on its own: RFC 4180 has no state between
/// records).
pub fn rows_text<R, T>(header: &[String], n: usize, row: R) -> String
where
    R: Fn(usize) -> Vec<T> + Sync,
    T: AsRef<str>,
{
    const BLOCK: usize = 2048;
    let block = |b: usize| -> Vec<u8> {
        let mut w = csv::Writer::from_writer(Vec::new());
        for i in b * BLOCK..((b + 1) * BLOCK).min(n) {
            write_row(&mut w, row(i));
        }
        w.into_inner().unwrap_or_default()
    };
    let mut w = csv::Writer::from_writer(Vec::new());
    write_row(&mut w, header);
    let mut text = w.into_inner().unwrap_or_default();
    let blocks = n.div_ceil(BLOCK);
    let parts: Vec<Vec<u8>> = crate::cores::map_range(blocks, block);
    text.reserve(parts.iter().map(Vec::len).sum());
    for p in parts {
        text.extend_from_slice(&p);
    }
    String::from_utf8(text).unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_formula_lead_is_neutralised() {
        for s in [
            "=1+1", "+A1", "-A1", "@A1", "\tx", "\rx", "-", "+", "-inf", "-NaN", "--1",
        ] {
            assert!(safe_cell(s).starts_with('\''), "{s:?}");
        }
        for s in ["-3.5", "+2", "-0.25e-3", "12", "", "0", "a=b", "-.5"] {
            assert_eq!(safe_cell(s), s, "{s:?}");
        }
    }

    #[test]
    fn rows_are_quoted_and_neutralised() {
        let mut w = csv::Writer::from_writer(Vec::new());
        write_row(&mut w, ["id", "name"]);
        write_row(&mut w, ["-1.5", "=cmd|' /C calc'!A0"]);
        let text = csv_text(w);
        let rows: Vec<csv::StringRecord> = csv::Reader::from_reader(text.as_bytes())
            .records()
            .filter_map(|r| r.ok())
            .collect();
        assert_eq!(&rows[0][0], "-1.5");
        assert_eq!(&rows[0][1], "'=cmd|' /C calc'!A0");
    }

    #[test]
    fn rows_in_blocks_read_as_written_one_by_one() {
        // Several blocks, a quoted cell and a formula-like one: the same text as one writer.
        let n = 5000;
        let cell = |i: usize| -> Vec<String> {
            vec![i.to_string(), format!("a,\"{i}\""), format!("={i}")]
        };
        let header = vec!["i".to_string(), "quoted".into(), "formula".into()];
        let mut w = csv::Writer::from_writer(Vec::new());
        write_row(&mut w, &header);
        for i in 0..n {
            write_row(&mut w, cell(i));
        }
        assert_eq!(rows_text(&header, n, cell), csv_text(w));
        assert_eq!(rows_text(&header, 0, cell), "i,quoted,formula\n");
    }
}
