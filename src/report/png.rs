//! PNG copies of the plots: our SVG rasterised by `resvg`, text drawn with
//! the bundled DejaVu Sans (assets/fonts), never a system font, so a PNG is
//! the same on every machine and needs no font installed.

use std::sync::{Arc, OnceLock};

use resvg::{tiny_skia, usvg};

/// The bundled font (see assets/fonts/README.md for its licence).
const FONT: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");
const FONT_FAMILY: &str = "DejaVu Sans";

/// Largest PNG side drawn, px (a 6000 px log plot fits; the cap bounds memory
/// at about 4 bytes × side² in the worst case).
pub const MAX_SIDE_PX: u32 = 8000;

/// The font database, loaded once per process.
fn fonts() -> Arc<usvg::fontdb::Database> {
    static DB: OnceLock<Arc<usvg::fontdb::Database>> = OnceLock::new();
    DB.get_or_init(|| {
        let mut db = usvg::fontdb::Database::new();
        db.load_font_data(FONT.to_vec());
        for set in [
            usvg::fontdb::Database::set_sans_serif_family,
            usvg::fontdb::Database::set_serif_family,
            usvg::fontdb::Database::set_monospace_family,
        ] {
            set(&mut db, FONT_FAMILY);
        }
        Arc::new(db)
    })
    .clone()
}

/// Why a plot cannot be rasterised.
#[derive(Debug, thiserror::Error)]
pub enum PngError {
    /// The SVG text does not parse.
    #[error("SVG not readable: {0}")]
    Svg(#[from] usvg::Error),
    /// The plot is larger than [`MAX_SIDE_PX`] on a side.
    #[error("plot of {width} x {height} px is above the {MAX_SIDE_PX} px PNG limit")]
    TooLarge { width: u32, height: u32 },
    /// The plot has no area.
    #[error("empty plot")]
    Empty,
    /// The PNG encoder failed.
    #[error("PNG encoding failed: {0}")]
    Encode(String),
}

/// Rasterise an SVG document to PNG bytes at its own size (1 px per unit).
pub fn svg_to_png(svg: &str) -> Result<Vec<u8>, PngError> {
    let opt = usvg::Options {
        fontdb: fonts(),
        ..usvg::Options::default()
    };
    let tree = usvg::Tree::from_str(svg, &opt)?;
    let size = tree.size().to_int_size();
    if size.width() > MAX_SIDE_PX || size.height() > MAX_SIDE_PX {
        return Err(PngError::TooLarge {
            width: size.width(),
            height: size.height(),
        });
    }
    let mut pixmap = tiny_skia::Pixmap::new(size.width(), size.height()).ok_or(PngError::Empty)?;
    resvg::render(&tree, tiny_skia::Transform::default(), &mut pixmap.as_mut());
    pixmap
        .encode_png()
        .map_err(|e| PngError::Encode(e.to_string()))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::svg::{Anchor, Svg};

    /// A filled square lands where drawn, in its colour, and text is drawn
    /// (dark pixels where the label is) with the bundled font alone: the
    /// crate is built without resvg's system-font loading.
    #[test]
    fn rasterises_shapes_and_text_without_system_fonts() {
        let mut s = Svg::new(200.0, 100.0);
        s.rect(10.0, 10.0, 30.0, 30.0, "#0072B2", None);
        s.text(60.0, 60.0, "GR gAPI 150", 24.0, Anchor::Start);
        let png = svg_to_png(&s.finish()).expect("rendered");
        assert!(png.starts_with(b"\x89PNG\r\n\x1a\n"));
        let img = tiny_skia::Pixmap::decode_png(&png).expect("decodes");
        assert_eq!((img.width(), img.height()), (200, 100));
        let px = |x: u32, y: u32| img.pixel(x, y).expect("inside").demultiply();
        let c = px(25, 25);
        assert_eq!((c.red(), c.green(), c.blue()), (0x00, 0x72, 0xB2));
        let w = px(150, 90);
        assert_eq!((w.red(), w.green(), w.blue()), (255, 255, 255));
        let dark = (60..190)
            .flat_map(|x| (38..62).map(move |y| (x, y)))
            .filter(|&(x, y)| px(x, y).red() < 100)
            .count();
        assert!(dark > 100, "{dark} dark pixels where the text is");
    }

    #[test]
    fn refuses_bad_and_huge_documents() {
        assert!(svg_to_png("not svg").is_err());
        let huge = Svg::new(10.0, 9000.0).finish();
        let e = svg_to_png(&huge).expect_err("too tall");
        assert!(matches!(e, PngError::TooLarge { .. }), "{e}");
        assert!(e.to_string().contains("limit"), "{e}");
    }
}
