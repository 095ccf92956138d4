//! SVG to PNG (resvg) and to PDF (svg2pdf, one page per sheet), with the
//! fonts shipped in the build (Ubuntu Light and Hack, the fonts egui ships;
//! licences in the README).

use pdf_writer::{Content, Finish as _, Name, Pdf, Rect, Ref};
use svg2pdf::usvg;

/// Least and most dots per inch for a PNG.
pub const DPI_RANGE: (f64, f64) = (10.0, 1200.0);

/// Most pixels a PNG may have (ANSI D at 300 dpi is 67 million).
pub const MAX_PIXELS: f64 = 150.0e6;

/// Why a sheet could not be rendered.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum RenderError {
    /// A dpi outside [`DPI_RANGE`].
    #[error("{0} dpi is outside 10 to 1200 dpi")]
    Dpi(f64),
    /// Too many pixels.
    #[error("{width} × {height} pixels is more than {} million; lower the dpi", MAX_PIXELS / 1e6)]
    TooLarge {
        /// Width, px.
        width: u64,
        /// Height, px.
        height: u64,
    },
    /// The SVG or the renderer failed (a bug: our SVG is always valid).
    #[error("rendering failed: {0}")]
    Failed(String),
}

fn options() -> usvg::Options<'static> {
    let mut options = usvg::Options::default();
    let db = options.fontdb_mut();
    db.load_font_data(epaint_default_fonts::UBUNTU_LIGHT.to_vec());
    db.load_font_data(epaint_default_fonts::HACK_REGULAR.to_vec());
    db.set_sans_serif_family("Ubuntu");
    options.font_family = "Ubuntu".to_owned();
    options
}

fn tree(svg: &str) -> Result<usvg::Tree, RenderError> {
    usvg::Tree::from_str(svg, &options()).map_err(|e| RenderError::Failed(e.to_string()))
}

fn pixmap(svg: &str, dpi: f64) -> Result<resvg::tiny_skia::Pixmap, RenderError> {
    if !(dpi.is_finite() && dpi >= DPI_RANGE.0 && dpi <= DPI_RANGE.1) {
        return Err(RenderError::Dpi(dpi));
    }
    let tree = tree(svg)?;
    // usvg reads mm as 96 px per inch; the pixmap is scaled to the dpi.
    let size = tree.size();
    let scale = dpi / 96.0;
    let (w, h) = ((f64::from(size.width()) * scale).ceil(), (f64::from(size.height()) * scale).ceil());
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let (width, height) = (w as u64, h as u64);
    if w * h > MAX_PIXELS {
        return Err(RenderError::TooLarge { width, height });
    }
    let (Ok(pw), Ok(ph)) = (u32::try_from(width), u32::try_from(height)) else {
        return Err(RenderError::TooLarge { width, height });
    };
    let mut pixmap = resvg::tiny_skia::Pixmap::new(pw, ph).ok_or(RenderError::TooLarge { width, height })?;
    #[allow(clippy::cast_possible_truncation)]
    let transform = resvg::tiny_skia::Transform::from_scale(scale as f32, scale as f32);
    resvg::render(&tree, transform, &mut pixmap.as_mut());
    Ok(pixmap)
}

/// The sheet `svg` (sized in mm) as PNG bytes at `dpi`.
///
/// # Errors
/// [`RenderError`] for a dpi out of range or an image over [`MAX_PIXELS`].
pub fn png(svg: &str, dpi: f64) -> Result<Vec<u8>, RenderError> {
    pixmap(svg, dpi)?.encode_png().map_err(|e| RenderError::Failed(e.to_string()))
}

/// The sheet `svg` as premultiplied RGBA pixels at `dpi` (for an on-screen
/// preview): (width, height, pixels).
///
/// # Errors
/// As [`png`].
pub fn raster(svg: &str, dpi: f64) -> Result<(u32, u32, Vec<u8>), RenderError> {
    let pixmap = pixmap(svg, dpi)?;
    Ok((pixmap.width(), pixmap.height(), pixmap.take()))
}

/// Every sheet as one PDF, one page per sheet, each page the sheet's size,
/// vector throughout with real text.
///
/// # Errors
/// [`RenderError::Failed`] if conversion fails.
pub fn pdf(svgs: &[String]) -> Result<Vec<u8>, RenderError> {
    let mut next = 1;
    let mut alloc = || {
        let r = Ref::new(next);
        next += 1;
        r
    };
    let catalog = alloc();
    let tree_ref = alloc();
    let mut pdf = Pdf::new();
    let mut pages = Vec::new();
    let mut chunks = Vec::new();
    for svg in svgs {
        let tree = tree(svg)?;
        let (chunk, id) = svg2pdf::to_chunk(&tree, svg2pdf::ConversionOptions::default())
            .map_err(|e| RenderError::Failed(e.to_string()))?;
        let mut map = std::collections::HashMap::new();
        let chunk = chunk.renumber(|old| *map.entry(old).or_insert_with(&mut alloc));
        let id =
            map.get(&id).copied().ok_or_else(|| RenderError::Failed("no drawing in the page".to_owned()))?;
        // usvg sizes are 96 px per inch; a PDF point is 1/72 in.
        let size = tree.size();
        let (w, h) = (size.width() * 0.75, size.height() * 0.75);
        let page = alloc();
        let content = alloc();
        pages.push((page, content, id, w, h));
        chunks.push(chunk);
    }
    pdf.catalog(catalog).pages(tree_ref);
    #[allow(clippy::cast_possible_truncation, clippy::cast_possible_wrap)]
    pdf.pages(tree_ref).kids(pages.iter().map(|p| p.0)).count(pages.len() as i32);
    let name = Name(b"Sheet");
    for &(page, content, id, w, h) in &pages {
        let mut p = pdf.page(page);
        p.media_box(Rect::new(0.0, 0.0, w, h));
        p.parent(tree_ref);
        p.contents(content);
        p.resources().x_objects().pair(name, id);
        p.finish();
        let mut c = Content::new();
        c.transform([w, 0.0, 0.0, h, 0.0, 0.0]).x_object(name);
        pdf.stream(content, &c.finish());
    }
    for chunk in &chunks {
        pdf.extend(chunk);
    }
    Ok(pdf.finish())
}
