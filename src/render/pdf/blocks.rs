//! Markdown to a small tree of blocks.
//!
//! The layout engine works on whole blocks (it has to measure a table before it
//! draws the first row, and a heading must know what follows it), so the event
//! stream of pulldown-cmark is first collected into [`Block`]s. Only what a
//! calculation package uses is kept; anything else degrades to plain text rather
//! than disappearing, so no content is lost silently.

use pulldown_cmark::{Alignment, Event, HeadingLevel, Options, Parser, Tag, TagEnd};

/// A run of text in one style.
#[derive(Debug, Clone, PartialEq)]
pub struct Span {
    /// The text; `"\n"` alone is a hard line break.
    pub text: String,
    /// Strong emphasis.
    pub bold: bool,
    /// Emphasis.
    pub italic: bool,
    /// Inline code (set in the monospaced face).
    pub code: bool,
}

impl Span {
    /// Whether this span is a hard line break.
    pub fn is_break(&self) -> bool {
        self.text == "\n"
    }
}

/// Horizontal alignment of a table column.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Align {
    /// Flush left (also the default when the Markdown gives none).
    Left,
    /// Centred.
    Center,
    /// Flush right, for columns of numbers.
    Right,
}

/// A GFM table.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Table {
    /// One alignment per column of the delimiter row.
    pub aligns: Vec<Align>,
    /// The header cells.
    pub head: Vec<Vec<Span>>,
    /// The body rows, each a list of cells.
    pub rows: Vec<Vec<Vec<Span>>>,
}

impl Table {
    /// Number of columns: the widest of the header and the rows.
    pub fn columns(&self) -> usize {
        self.rows.iter().map(Vec::len).chain([self.head.len(), self.aligns.len()]).max().unwrap_or(0)
    }
}

/// One block of the document.
#[derive(Debug, Clone, PartialEq)]
pub enum Block {
    /// A heading of level 1 to 6 (5 and 6 are set like 4).
    Heading {
        /// Level, 1 being the largest.
        level: u8,
        /// Heading text.
        text: Vec<Span>,
    },
    /// A paragraph of running text.
    Paragraph(Vec<Span>),
    /// A bullet list (`start` is `None`) or a numbered list.
    List {
        /// Number of the first item of a numbered list.
        start: Option<u64>,
        /// Whether the items are set close together (no blank lines between
        /// them in the Markdown).
        tight: bool,
        /// The items, each a sequence of blocks.
        items: Vec<Vec<Block>>,
    },
    /// A block quote.
    Quote(Vec<Block>),
    /// A fenced or indented code block, verbatim.
    Code(String),
    /// A horizontal rule.
    Rule,
    /// A table.
    Table(Table),
    /// A figure: `![caption](name)` with `name` a key of the figure map.
    Figure {
        /// The figure's key.
        name: String,
        /// The alternative text, used as the caption.
        caption: String,
    },
    /// `<!-- page-break -->`: the next block starts a new page.
    PageBreak,
}

/// Whether an HTML block is the page-break directive.
fn is_page_break(html: &str) -> bool {
    let t = html.trim();
    let Some(inner) = t.strip_prefix("<!--").and_then(|r| r.strip_suffix("-->")) else {
        return false;
    };
    inner.trim().eq_ignore_ascii_case("page-break")
}

/// Deepest nesting of quotes, lists and list items that is kept. Deeper
/// containers are merged into the one at this depth: each level indents the
/// text, so beyond this there is no room left to show it, and a bounded tree
/// also keeps the recursive layout (and the dropping of the tree) well within
/// the stack whatever the input.
const MAX_DEPTH: usize = 24;

/// What the inline text being collected will become.
enum InlineKind {
    Paragraph,
    /// A paragraph opened implicitly by the text of a tight list item.
    ImplicitParagraph,
    Heading(u8),
    Cell,
}

/// A container of blocks under construction.
enum Container {
    Root(Vec<Block>),
    Quote(Vec<Block>),
    List { start: Option<u64>, loose: bool, items: Vec<Vec<Block>> },
    Item(Vec<Block>),
}

/// Collects pulldown-cmark events into blocks.
struct Builder {
    stack: Vec<Container>,
    inline: Option<(InlineKind, Vec<Span>)>,
    /// Alt text of an image being read: (destination, text).
    image: Option<(String, String)>,
    /// Nesting depth of images inside the one being read (alt text of nested
    /// images is flattened into the outer one).
    image_depth: usize,
    code: Option<String>,
    html: Option<String>,
    table: Option<Table>,
    row: Vec<Vec<Span>>,
    in_head: bool,
    bold: usize,
    italic: usize,
    /// One entry per open quote, list or item event: whether it was merged
    /// into its parent (beyond [`MAX_DEPTH`]) instead of opening a container.
    merged: Vec<bool>,
}

impl Builder {
    fn new() -> Builder {
        Builder {
            stack: vec![Container::Root(Vec::new())],
            inline: None,
            image: None,
            image_depth: 0,
            code: None,
            html: None,
            table: None,
            row: Vec::new(),
            in_head: false,
            bold: 0,
            italic: 0,
            merged: Vec::new(),
        }
    }

    /// Appends a finished block to the innermost container that holds blocks.
    fn push_block(&mut self, block: Block) {
        match self.stack.last_mut() {
            Some(Container::Root(v)) | Some(Container::Quote(v)) | Some(Container::Item(v)) => v.push(block),
            // A block directly in a list (not in an item) cannot come from the
            // parser; keep it anyway as an item of its own.
            Some(Container::List { items, .. }) => items.push(vec![block]),
            None => self.stack.push(Container::Root(vec![block])),
        }
    }

    /// Ends the paragraph opened implicitly by a tight list item, if any.
    fn close_implicit(&mut self) {
        if matches!(self.inline, Some((InlineKind::ImplicitParagraph, _))) {
            self.finish_inline();
        }
    }

    fn finish_inline(&mut self) {
        let Some((kind, spans)) = self.inline.take() else {
            return;
        };
        match kind {
            InlineKind::Paragraph | InlineKind::ImplicitParagraph => {
                if spans.iter().any(|s| !s.text.trim().is_empty()) {
                    self.push_block(Block::Paragraph(spans));
                }
            }
            InlineKind::Heading(level) => self.push_block(Block::Heading { level, text: spans }),
            InlineKind::Cell => self.row.push(spans),
        }
    }

    /// Adds inline text in the current style, opening an implicit paragraph
    /// when text appears directly in a list item.
    fn text(&mut self, text: &str, code: bool) {
        if let Some((_, alt)) = self.image.as_mut() {
            alt.push_str(text);
            return;
        }
        if let Some(buf) = self.code.as_mut() {
            buf.push_str(text);
            return;
        }
        if self.inline.is_none() {
            self.inline = Some((InlineKind::ImplicitParagraph, Vec::new()));
        }
        let span = Span { text: text.to_string(), bold: self.bold > 0, italic: self.italic > 0, code };
        if let Some((_, spans)) = self.inline.as_mut() {
            spans.push(span);
        }
    }

    /// Records the start of a quote or list; returns whether it opens a
    /// container of its own (false when it is merged into its parent).
    fn open_container(&mut self) -> bool {
        let open = self.stack.len() <= MAX_DEPTH;
        self.merged.push(!open);
        open
    }

    fn start(&mut self, tag: Tag<'_>) {
        if self.image.is_some() {
            if matches!(tag, Tag::Image { .. }) {
                self.image_depth += 1;
            }
            return;
        }
        match tag {
            Tag::Paragraph => {
                self.close_implicit();
                if let Some(Container::List { loose, .. }) = self.stack.iter_mut().rev().nth(1) {
                    *loose = true;
                }
                self.inline = Some((InlineKind::Paragraph, Vec::new()));
            }
            Tag::Heading { level, .. } => {
                self.close_implicit();
                let level = match level {
                    HeadingLevel::H1 => 1,
                    HeadingLevel::H2 => 2,
                    HeadingLevel::H3 => 3,
                    HeadingLevel::H4 => 4,
                    HeadingLevel::H5 => 5,
                    HeadingLevel::H6 => 6,
                };
                self.inline = Some((InlineKind::Heading(level), Vec::new()));
            }
            Tag::BlockQuote(_) => {
                self.close_implicit();
                if self.open_container() {
                    self.stack.push(Container::Quote(Vec::new()));
                }
            }
            Tag::CodeBlock(_) => {
                self.close_implicit();
                self.code = Some(String::new());
            }
            Tag::HtmlBlock => {
                self.close_implicit();
                self.html = Some(String::new());
            }
            Tag::List(start) => {
                self.close_implicit();
                if !self.open_container() {
                    return;
                }
                self.stack.push(Container::List { start, loose: false, items: Vec::new() });
            }
            Tag::Item => {
                // An item of a merged list is merged too; an item of a kept
                // list is always kept, or the list would lose its items.
                if self.merged.last() == Some(&true) {
                    self.merged.push(true);
                } else {
                    self.merged.push(false);
                    self.stack.push(Container::Item(Vec::new()));
                }
            }
            Tag::Table(aligns) => {
                self.close_implicit();
                let aligns = aligns
                    .iter()
                    .map(|a| match a {
                        Alignment::Center => Align::Center,
                        Alignment::Right => Align::Right,
                        Alignment::Left | Alignment::None => Align::Left,
                    })
                    .collect();
                self.table = Some(Table { aligns, ..Table::default() });
            }
            Tag::TableHead => {
                self.in_head = true;
                self.row.clear();
            }
            Tag::TableRow => self.row.clear(),
            Tag::TableCell => self.inline = Some((InlineKind::Cell, Vec::new())),
            Tag::Emphasis => self.italic += 1,
            Tag::Strong => self.bold += 1,
            Tag::Image { dest_url, .. } => {
                // A figure needs a block of its own. In a heading or table cell
                // that is impossible, so there the caption is kept as text.
                match self.inline.as_ref().map(|(k, _)| k) {
                    Some(InlineKind::Heading(_)) | Some(InlineKind::Cell) => {}
                    _ => {
                        // Text before the image stays a paragraph of its own.
                        let resume = match self.inline.as_ref().map(|(k, _)| k) {
                            Some(InlineKind::Paragraph) => InlineKind::Paragraph,
                            _ => InlineKind::ImplicitParagraph,
                        };
                        self.finish_inline();
                        self.inline = Some((resume, Vec::new()));
                        self.image = Some((dest_url.to_string(), String::new()));
                    }
                }
            }
            // Links keep their text; the address is not printed in a package.
            _ => {}
        }
    }

    fn end(&mut self, tag: TagEnd) {
        if self.image.is_some() {
            if tag == TagEnd::Image {
                if self.image_depth > 0 {
                    self.image_depth -= 1;
                } else if let Some((name, caption)) = self.image.take() {
                    self.push_block(Block::Figure { name, caption: caption.trim().to_string() });
                }
            }
            return;
        }
        match tag {
            TagEnd::Paragraph | TagEnd::Heading(_) => self.finish_inline(),
            TagEnd::TableCell => self.finish_inline(),
            TagEnd::BlockQuote(_) => {
                self.close_implicit();
                if self.merged.pop().unwrap_or(false) {
                    return;
                }
                if let Some(Container::Quote(blocks)) = self.stack.last() {
                    let blocks = blocks.clone();
                    self.stack.pop();
                    self.push_block(Block::Quote(blocks));
                }
            }
            TagEnd::CodeBlock => {
                if let Some(mut code) = self.code.take() {
                    while code.ends_with('\n') {
                        code.pop();
                    }
                    self.push_block(Block::Code(code));
                }
            }
            TagEnd::HtmlBlock => {
                if let Some(html) = self.html.take() {
                    if is_page_break(&html) {
                        self.push_block(Block::PageBreak);
                    } else if !html.trim_start().starts_with("<!--") && !html.trim().is_empty() {
                        // Raw HTML is not interpreted, but it is printed so that
                        // nothing the author wrote goes missing.
                        self.push_block(Block::Code(html.trim_end().to_string()));
                    }
                }
            }
            TagEnd::Item => {
                self.close_implicit();
                if self.merged.pop().unwrap_or(false) {
                    return;
                }
                if let Some(Container::Item(_)) = self.stack.last() {
                    if let Some(Container::Item(blocks)) = self.stack.pop() {
                        if let Some(Container::List { items, .. }) = self.stack.last_mut() {
                            items.push(blocks);
                        } else {
                            self.push_block(Block::Quote(blocks));
                        }
                    }
                }
            }
            TagEnd::List(_) => {
                self.close_implicit();
                if self.merged.pop().unwrap_or(false) {
                    return;
                }
                if let Some(Container::List { .. }) = self.stack.last() {
                    if let Some(Container::List { start, loose, items }) = self.stack.pop() {
                        self.push_block(Block::List { start, tight: !loose, items });
                    }
                }
            }
            TagEnd::TableHead => {
                self.in_head = false;
                if let Some(t) = self.table.as_mut() {
                    t.head = std::mem::take(&mut self.row);
                }
            }
            TagEnd::TableRow => {
                if let Some(t) = self.table.as_mut() {
                    t.rows.push(std::mem::take(&mut self.row));
                }
            }
            TagEnd::Table => {
                if let Some(t) = self.table.take() {
                    self.push_block(Block::Table(t));
                }
            }
            TagEnd::Emphasis => self.italic = self.italic.saturating_sub(1),
            TagEnd::Strong => self.bold = self.bold.saturating_sub(1),
            _ => {}
        }
    }

    fn event(&mut self, event: Event<'_>) {
        match event {
            Event::Start(tag) => self.start(tag),
            Event::End(tag) => self.end(tag),
            Event::Text(t) => self.text(&t, false),
            Event::Code(t) => self.text(&t, true),
            Event::InlineMath(t) | Event::DisplayMath(t) => self.text(&t, true),
            Event::Html(t) => {
                if let Some(buf) = self.html.as_mut() {
                    buf.push_str(&t);
                }
            }
            Event::InlineHtml(t) => {
                let tag = t.trim().to_ascii_lowercase();
                if tag == "<br>" || tag == "<br/>" || tag == "<br />" {
                    self.text("\n", false);
                } else if !tag.starts_with("<!--") {
                    self.text(&t, false);
                }
            }
            Event::SoftBreak => self.text(" ", false),
            Event::HardBreak => self.text("\n", false),
            Event::Rule => {
                self.close_implicit();
                self.push_block(Block::Rule);
            }
            Event::FootnoteReference(label) => self.text(&format!("[{label}]"), false),
            Event::TaskListMarker(done) => self.text(if done { "☑ " } else { "☐ " }, false),
        }
    }

    fn finish(mut self) -> Vec<Block> {
        self.finish_inline();
        // Close anything left open (the parser always balances its events, but
        // the builder must not lose content if it ever does not).
        while self.stack.len() > 1 {
            match self.stack.pop() {
                Some(Container::Quote(b)) | Some(Container::Item(b)) => self.push_block(Block::Quote(b)),
                Some(Container::List { start, loose, items }) => {
                    self.push_block(Block::List { start, tight: !loose, items })
                }
                Some(Container::Root(b)) => {
                    for block in b {
                        self.push_block(block);
                    }
                }
                None => {}
            }
        }
        match self.stack.pop() {
            Some(Container::Root(b)) => b,
            _ => Vec::new(),
        }
    }
}

/// Parses Markdown (CommonMark with GFM tables) into blocks.
pub fn parse(markdown: &str) -> Vec<Block> {
    let mut builder = Builder::new();
    for event in Parser::new_ext(markdown, Options::ENABLE_TABLES) {
        builder.event(event);
    }
    builder.finish()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn plain(spans: &[Span]) -> String {
        spans.iter().map(|s| s.text.as_str()).collect()
    }

    #[test]
    fn headings_paragraphs_and_styles() {
        let blocks = parse("# Title\n\nSome **bold** and *it* and `code`.\n");
        assert_eq!(blocks.len(), 2);
        let Block::Heading { level: 1, text } = &blocks[0] else { panic!("{blocks:?}") };
        assert_eq!(plain(text), "Title");
        let Block::Paragraph(spans) = &blocks[1] else { panic!("{blocks:?}") };
        assert!(spans.iter().any(|s| s.bold && s.text == "bold"));
        assert!(spans.iter().any(|s| s.italic && s.text == "it"));
        assert!(spans.iter().any(|s| s.code && s.text == "code"));
    }

    #[test]
    fn tight_and_loose_lists_and_nesting() {
        let blocks = parse("- a\n- b\n  1. x\n  2. y\n\n3. p\n\n4. q\n");
        let Block::List { start: None, tight: true, items } = &blocks[0] else { panic!("{blocks:?}") };
        assert_eq!(items.len(), 2);
        assert!(matches!(items[1][1], Block::List { start: Some(1), .. }));
        assert!(matches!(blocks[1], Block::List { start: Some(3), tight: false, .. }));
    }

    #[test]
    fn tables_keep_alignment_header_and_rows() {
        let blocks = parse("| a | b |\n|:--|--:|\n| 1 | 2 |\n| 3 |\n");
        let Block::Table(t) = &blocks[0] else { panic!("{blocks:?}") };
        assert_eq!(t.aligns, vec![Align::Left, Align::Right]);
        assert_eq!(t.head.len(), 2);
        assert_eq!(t.rows.len(), 2);
        assert_eq!(plain(&t.rows[0][1]), "2");
        assert_eq!(t.columns(), 2);
    }

    #[test]
    fn figures_page_breaks_and_comments() {
        let md = "Before ![Head profile](head) after\n\n<!-- page-break -->\n\n<!-- note -->\n\nEnd\n";
        let blocks = parse(md);
        assert!(matches!(&blocks[0], Block::Paragraph(s) if plain(s).trim() == "Before"));
        assert!(matches!(&blocks[1], Block::Figure { name, caption } if name == "head" && caption == "Head profile"));
        assert!(matches!(&blocks[2], Block::Paragraph(s) if plain(s).trim() == "after"));
        assert_eq!(blocks[3], Block::PageBreak);
        assert!(matches!(&blocks[4], Block::Paragraph(s) if plain(s) == "End"));
        assert_eq!(blocks.len(), 5);
    }

    fn depth(block: &Block) -> usize {
        match block {
            Block::Quote(b) => 1 + b.iter().map(depth).max().unwrap_or(0),
            Block::List { items, .. } => 2 + items.iter().flatten().map(depth).max().unwrap_or(0),
            _ => 0,
        }
    }

    #[test]
    fn very_deep_nesting_is_merged_at_a_bounded_depth() {
        let quotes = format!("{} deep\n", ">".repeat(5000));
        let blocks = parse(&quotes);
        assert!(depth(&blocks[0]) <= MAX_DEPTH, "{}", depth(&blocks[0]));
        let lists: String = (0..200).map(|i| format!("{}- level {i}\n", "  ".repeat(i))).collect();
        let blocks = parse(&lists);
        assert!(depth(&blocks[0]) <= MAX_DEPTH + 1, "{}", depth(&blocks[0]));
        // Nothing is lost: the innermost text is still there.
        assert!(format!("{blocks:?}").contains("level 199"));
    }

    #[test]
    fn quotes_code_and_rules() {
        let blocks = parse("> quoted\n\n```\nx = 1\n```\n\n---\n");
        assert!(matches!(&blocks[0], Block::Quote(b) if b.len() == 1));
        assert_eq!(blocks[1], Block::Code("x = 1".to_string()));
        assert_eq!(blocks[2], Block::Rule);
    }
}
