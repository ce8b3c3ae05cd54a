//! Writes the SDF glyph ranges that the page's map labels use, one `{start}-{end}.pbf` per
//! range of 256 code points, as MapLibre reads them (24 px, 3 px buffer, radius 8, cutoff
//! 0.25: the conventions the glyph format's renderers share). A build tool: no logic of the
//! audit lives here.
//!
//! Usage: `catchwalk-glyphs FONT OUTDIR START...` where each START is a multiple of 256.

use std::path::Path;
use std::process::ExitCode;

use pbf_font_tools::prost::Message;

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let [font, out, starts @ ..] = args.as_slice() else {
        eprintln!("usage: catchwalk-glyphs FONT OUTDIR START...");
        return ExitCode::from(2);
    };
    if starts.is_empty() {
        eprintln!("catchwalk-glyphs: name at least one range start (0, 256, ...)");
        return ExitCode::from(2);
    }
    if let Err(e) = std::fs::create_dir_all(out) {
        eprintln!("catchwalk-glyphs: cannot create {out}: {e}");
        return ExitCode::FAILURE;
    }
    for s in starts {
        let start: u32 = match s.parse() {
            Ok(v) if v % 256 == 0 && v < 65536 => v,
            _ => {
                eprintln!("catchwalk-glyphs: range start {s} is not a multiple of 256 below 65536");
                return ExitCode::from(2);
            }
        };
        let end = start + 255;
        let mut glyphs = match pbf_font_tools::glyph_range_for_font(font, start, end, 24, 8, 0.25) {
            Ok(g) => g,
            Err(e) => {
                eprintln!("catchwalk-glyphs: cannot render {start}-{end} from {font}: {e}");
                return ExitCode::FAILURE;
            }
        };
        // A glyph with no outline (a space) keeps its advance but no bitmap: a bitmap of its
        // bare buffer would draw as a faint dot between words.
        for g in glyphs.stacks.iter_mut().flat_map(|s| s.glyphs.iter_mut()) {
            if g.width == 0 || g.height == 0 {
                g.bitmap = None;
            }
        }
        let path = Path::new(out).join(format!("{start}-{end}.pbf"));
        if let Err(e) = std::fs::write(&path, glyphs.encode_to_vec()) {
            eprintln!("catchwalk-glyphs: cannot write {}: {e}", path.display());
            return ExitCode::FAILURE;
        }
    }
    ExitCode::SUCCESS
}
