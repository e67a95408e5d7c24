//! Tables: column widths from content, wrapped cells, a repeated head.
//!
//! Column widths follow the usual automatic rule for text tables: every column
//! gets at least its widest word and, when the page allows, its whole content
//! on one line; the room in between is shared in proportion to what each
//! column would need to avoid wrapping. The table is set a size smaller than
//! body text so that six or seven columns of formulas fit an A4 portrait page.
//! Rules are horizontal only (a heavier rule above and below, a lighter one
//! under the head, hairlines between rows): vertical rules add ink, not
//! information.

use super::blocks::{Align, Span, Table};
use super::layout::{Item, Layouter, BASELINE};
use std::rc::Rc;

use super::text::{min_max_width_of, words, wrap_words, BaseStyle, TextLine, Word};

/// Text size in tables, pt.
const SIZE: f32 = 8.3;
/// Line height in tables, pt.
const LINE: f32 = SIZE * 1.27;
/// Padding left and right of each cell's text, pt.
const PAD_X: f32 = 3.0;
/// Padding above and below each row's text, pt.
const PAD_Y: f32 = 2.2;
/// Weight of the rules above and below the table, pt.
const OUTER_RULE: f32 = 0.7;
/// Weight of the rule under the head, pt.
const HEAD_RULE: f32 = 0.4;
/// Weight and grey of the hairlines between rows.
const ROW_RULE: (f32, f32) = (0.25, 0.7);

fn style(bold: bool) -> BaseStyle {
    BaseStyle { size: SIZE, bold, italic: false }
}

/// A row with its cells broken into lines.
struct Row {
    cells: Vec<Vec<TextLine>>,
    height: f32,
}

/// A table measured for a given width.
pub struct Measured {
    widths: Vec<f32>,
    aligns: Vec<Align>,
    head: Row,
    rows: Vec<Row>,
}

/// Shares `avail` points among columns with the given narrowest and natural
/// widths (both including padding).
fn column_widths(min: &[f32], max: &[f32], avail: f32) -> Vec<f32> {
    let sum_min: f32 = min.iter().sum();
    let sum_max: f32 = max.iter().sum();
    let n = min.len().max(1) as f32;
    if sum_max <= avail {
        // Everything fits unwrapped: widen the columns to the full measure in
        // proportion to their content, so that tables line up with the text.
        let extra = avail - sum_max;
        if sum_max <= 0.0 {
            return vec![avail / n; min.len()];
        }
        return max.iter().map(|m| m + extra * m / sum_max).collect();
    }
    if sum_min <= avail {
        // Start from the narrowest widths. Columns that need less than an
        // equal share of the remaining room to avoid wrapping get all they
        // need first (a "Class 300" or "DN 100" must not wrap because a
        // column of remarks is long); what is left goes to the long columns
        // in proportion to what they still lack.
        let mut w = min.to_vec();
        let mut remaining = avail - sum_min;
        loop {
            let open: Vec<usize> = (0..w.len()).filter(|&c| max[c] - w[c] > 1e-3).collect();
            if open.is_empty() || remaining <= 1e-3 {
                break;
            }
            let fair = remaining / open.len() as f32;
            let small: Vec<usize> = open.iter().copied().filter(|&c| max[c] - w[c] <= fair).collect();
            if small.is_empty() {
                let lack: f32 = open.iter().map(|&c| max[c] - w[c]).sum();
                for &c in &open {
                    w[c] += remaining * (max[c] - w[c]) / lack;
                }
                break;
            }
            for c in small {
                remaining -= max[c] - w[c];
                w[c] = max[c];
            }
        }
        return w;
    }
    // Even the longest words do not fit. Columns whose longest word is within
    // an equal share keep it; only the columns with overlong words are
    // narrowed (in proportion to those words), and their words will then be
    // broken between characters.
    let mut w = min.to_vec();
    let mut fixed = vec![false; min.len()];
    loop {
        let rest = avail - (0..w.len()).filter(|&c| fixed[c]).map(|c| w[c]).sum::<f32>();
        let open: Vec<usize> = (0..w.len()).filter(|&c| !fixed[c]).collect();
        if open.is_empty() {
            break;
        }
        let fair = rest / open.len() as f32;
        let small: Vec<usize> = open.iter().copied().filter(|&c| min[c] <= fair).collect();
        if small.is_empty() {
            let total: f32 = open.iter().map(|&c| min[c]).sum();
            for &c in &open {
                w[c] = if total > 0.0 { rest.max(0.0) * min[c] / total } else { rest.max(0.0) / open.len() as f32 };
            }
            break;
        }
        for c in small {
            fixed[c] = true;
        }
    }
    w
}

impl Layouter<'_> {
    /// The table measured for `width`. A heading measures the table that
    /// follows it to keep the two together, and the table measures itself
    /// again when it is drawn; the result is kept per table and width so that
    /// the work is done once.
    fn measure(&self, t: &Table, width: f32) -> Rc<Measured> {
        let key = (t as *const Table as usize, width.to_bits());
        if let Some(m) = self.measured.borrow().get(&key) {
            return Rc::clone(m);
        }
        let m = Rc::new(self.measure_table(t, width));
        self.measured.borrow_mut().insert(key, Rc::clone(&m));
        m
    }

    fn measure_table(&self, t: &Table, width: f32) -> Measured {
        let cols = t.columns();
        // Every cell is split into words once, for measuring and for breaking.
        let split = |row: &[Vec<Span>], bold: bool| -> Vec<Vec<Word>> {
            (0..cols).map(|c| words(self.faces, row.get(c).map_or(&[][..], Vec::as_slice), style(bold))).collect()
        };
        let head = split(&t.head, true);
        let rows: Vec<Vec<Vec<Word>>> = t.rows.iter().map(|r| split(r, false)).collect();
        let mut min = vec![2.0 * PAD_X; cols];
        let mut max = vec![2.0 * PAD_X; cols];
        for c in 0..cols {
            let (mut lo, mut hi) = min_max_width_of(self.faces, &head[c], style(true));
            for row in &rows {
                let (a, b) = min_max_width_of(self.faces, &row[c], style(false));
                lo = lo.max(a);
                hi = hi.max(b);
            }
            min[c] += lo;
            max[c] += hi;
        }
        let widths = column_widths(&min, &max, width);
        let lay_row = |row: &[Vec<Word>]| -> Row {
            let cells: Vec<Vec<TextLine>> =
                row.iter().enumerate().map(|(c, w)| wrap_words(self.faces, w, widths[c] - 2.0 * PAD_X)).collect();
            let lines = cells.iter().map(Vec::len).max().unwrap_or(1);
            Row { height: lines as f32 * LINE + 2.0 * PAD_Y, cells }
        };
        let aligns = (0..cols).map(|c| t.aligns.get(c).copied().unwrap_or(Align::Left)).collect();
        Measured { head: lay_row(&head), rows: rows.iter().map(|r| lay_row(r)).collect(), widths, aligns }
    }

    /// Height of the head and first row of a table, which a heading keeps with it.
    pub fn table_keep_height(&self, t: &Table, width: f32) -> f32 {
        if t.columns() == 0 {
            return 0.0;
        }
        let m = self.measure(t, width);
        m.head.height + m.rows.first().map_or(0.0, |r| r.height) + 2.0
    }

    /// Draws lines `from..to` of every cell of a row, starting at the current y.
    fn draw_row_lines(&mut self, m: &Measured, row: &Row, x: f32, from: usize, to: usize) {
        let mut cx = x;
        for (c, lines) in row.cells.iter().enumerate() {
            let w = m.widths[c];
            let inner = w - 2.0 * PAD_X;
            for (k, line) in lines.iter().enumerate().take(to).skip(from) {
                let dx = match m.aligns[c] {
                    Align::Left => 0.0,
                    Align::Center => ((inner - line.width) / 2.0).max(0.0),
                    Align::Right => (inner - line.width).max(0.0),
                };
                let baseline = self.y + PAD_Y + (k - from) as f32 * LINE + LINE * BASELINE;
                self.draw_line(line, cx + PAD_X + dx, baseline);
            }
            cx += w;
        }
    }

    fn draw_head(&mut self, m: &Measured, x: f32, width: f32) {
        self.push(Item::rule((x, self.y), (x + width, self.y), OUTER_RULE, 0.0));
        let lines = m.head.cells.iter().map(Vec::len).max().unwrap_or(0);
        self.draw_row_lines(m, &m.head, x, 0, lines);
        self.y += m.head.height;
        // A table without rows closes with the outer rule alone.
        if !m.rows.is_empty() {
            self.push(Item::rule((x, self.y), (x + width, self.y), HEAD_RULE, 0.0));
        }
    }

    /// Closes the table part on this page and repeats the head on the next.
    fn continue_table(&mut self, m: &Measured, x: f32, width: f32) {
        self.push(Item::rule((x, self.y), (x + width, self.y), OUTER_RULE, 0.0));
        self.page_break();
        self.draw_head(m, x, width);
    }

    /// Lays out a table in the column from `x`, `width` wide.
    pub fn table(&mut self, t: &Table, x: f32, width: f32) {
        if t.columns() == 0 {
            return;
        }
        let m = self.measure(t, width);
        let m = &*m;
        let width: f32 = m.widths.iter().sum();
        let first = m.rows.first().map_or(0.0, |r| r.height);
        self.ensure(m.head.height + first.min(self.body_height() / 2.0));
        self.take_marker(self.y + PAD_Y + LINE * BASELINE);
        self.draw_head(m, x, width);
        let n = m.rows.len();
        for (i, row) in m.rows.iter().enumerate() {
            if !self.fits(row.height) {
                if m.head.height + row.height <= self.body_height() {
                    self.continue_table(m, x, width);
                } else {
                    self.tall_row(m, row, x, width);
                    if i + 1 < n {
                        self.hairline(x, width);
                    }
                    continue;
                }
            }
            let lines = row.cells.iter().map(Vec::len).max().unwrap_or(0);
            self.draw_row_lines(m, row, x, 0, lines);
            self.y += row.height;
            if i + 1 < n {
                self.hairline(x, width);
            }
        }
        self.push(Item::rule((x, self.y), (x + width, self.y), OUTER_RULE, 0.0));
    }

    fn hairline(&mut self, x: f32, width: f32) {
        self.push(Item::rule((x, self.y), (x + width, self.y), ROW_RULE.0, ROW_RULE.1));
    }

    /// A row taller than a whole page cannot be kept together: it is split
    /// between lines, never through one, and the head is repeated.
    fn tall_row(&mut self, m: &Measured, row: &Row, x: f32, width: f32) {
        let total = row.cells.iter().map(Vec::len).max().unwrap_or(0);
        let mut from = 0;
        // Set right after a fresh head: if even then no line fits (a head taller
        // than the page), one line is drawn anyway so that the loop ends.
        let mut fresh = false;
        while from < total {
            let room = ((self.geo.bottom - self.y - 2.0 * PAD_Y) / LINE).floor();
            let take = if room >= 1.0 { room as usize } else { usize::from(fresh) };
            if take == 0 {
                self.continue_table(m, x, width);
                fresh = true;
                continue;
            }
            let to = (from + take).min(total);
            self.draw_row_lines(m, row, x, from, to);
            self.y += (to - from) as f32 * LINE + 2.0 * PAD_Y;
            from = to;
            fresh = false;
            if from < total {
                self.continue_table(m, x, width);
                fresh = true;
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn columns_share_the_width_by_content() {
        // Natural widths fit: full measure, shared in proportion.
        let w = column_widths(&[10.0, 10.0], &[20.0, 60.0], 160.0);
        assert!((w[0] - 40.0).abs() < 1e-4 && (w[1] - 120.0).abs() < 1e-4);
        // Natural widths do not fit: between the minimum and the natural width.
        let w = column_widths(&[10.0, 20.0], &[50.0, 100.0], 90.0);
        assert!((w.iter().sum::<f32>() - 90.0).abs() < 1e-3);
        assert!(w[0] >= 10.0 && w[0] <= 50.0 && w[1] >= 20.0 && w[1] <= 100.0);
        // A short column gets its natural width before long ones share the rest.
        let w = column_widths(&[20.0, 30.0, 30.0], &[40.0, 300.0, 200.0], 200.0);
        assert!((w[0] - 40.0).abs() < 1e-3, "{w:?}");
        assert!((w.iter().sum::<f32>() - 200.0).abs() < 1e-3);
        assert!(w[1] > w[2]);
        // Not even the minimum fits: scaled down to the measure.
        let w = column_widths(&[100.0, 100.0], &[200.0, 200.0], 100.0);
        assert!((w[0] - 50.0).abs() < 1e-4);
        // Only the column with the overlong word is narrowed.
        let w = column_widths(&[1000.0, 10.0, 10.0], &[1000.0, 10.0, 10.0], 100.0);
        assert_eq!(&w[1..], &[10.0, 10.0]);
        assert!((w[0] - 80.0).abs() < 1e-3, "{w:?}");
        // Empty columns still get a share.
        let w = column_widths(&[0.0, 0.0], &[0.0, 0.0], 100.0);
        assert_eq!(w, vec![50.0, 50.0]);
    }
}
