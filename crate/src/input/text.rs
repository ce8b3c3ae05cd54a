//! Layer files as text: bytes that are not UTF-8 are refused with where the first bad byte
//! is and what to do, instead of a bare "invalid UTF-8".

/// Decodes a layer file's bytes as UTF-8 (a leading byte-order mark is kept for the readers,
/// which skip it). `what` names the file in the message.
///
/// ```
/// use catchwalk::input::text::decode_utf8;
/// assert_eq!(decode_utf8("homes.csv", b"id,lon\n").unwrap(), "id,lon\n");
/// let e = decode_utf8("homes.csv", b"id,name\n1,Caf\xe9\n").unwrap_err();
/// assert!(e.contains("line 2, column 6") && e.contains("re-save it as UTF-8"));
/// ```
pub fn decode_utf8(what: &str, bytes: &[u8]) -> Result<String, String> {
    match std::str::from_utf8(bytes) {
        Ok(s) => Ok(s.to_string()),
        Err(e) => {
            let good = bytes.get(..e.valid_up_to()).unwrap_or_default();
            let line = good.iter().filter(|&&b| b == b'\n').count() + 1;
            let line_start = good.iter().rposition(|&b| b == b'\n').map_or(0, |i| i + 1);
            let column = std::str::from_utf8(good.get(line_start..).unwrap_or_default())
                .map_or(1, |s| s.chars().count() + 1);
            let byte = bytes.get(e.valid_up_to()).copied().unwrap_or(0);
            Err(format!(
                "{what} is not UTF-8 text: byte 0x{byte:02X} at line {line}, column {column} (byte {}) is not valid UTF-8 (the file is probably in a legacy encoding such as Windows-1252 or Latin-1); re-save it as UTF-8 (in a spreadsheet: Save As, \"CSV UTF-8\"; in a GIS: export with encoding UTF-8) and load it again",
                e.valid_up_to()
            ))
        }
    }
}

/// At most `max` characters of `s`, with the full length said when it is cut (a
/// million-character name is not printed whole).
///
/// ```
/// use catchwalk::input::text::clip;
/// assert_eq!(clip("Elm", 10), "Elm");
/// assert_eq!(clip(&"x".repeat(1000), 5), "xxxxx… (1000 characters)");
/// ```
pub fn clip(s: &str, max: usize) -> std::borrow::Cow<'_, str> {
    match s.char_indices().nth(max) {
        None => std::borrow::Cow::Borrowed(s),
        Some((cut, _)) => std::borrow::Cow::Owned(format!(
            "{}… ({} characters)",
            s.get(..cut).unwrap_or_default(),
            s.chars().count()
        )),
    }
}
