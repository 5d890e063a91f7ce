//! Small HTML building blocks: escaping (through the `html-escape` crate), numbers tagged with
//! their SI value, and tables.

use html_escape::{encode_double_quoted_attribute, encode_text};

/// Escapes text for an element body.
#[must_use]
pub fn esc(text: &str) -> String {
    encode_text(text).into_owned()
}

/// Escapes text for a double-quoted attribute value.
#[must_use]
pub fn attr(text: &str) -> String {
    encode_double_quoted_attribute(text).into_owned()
}

/// A number as shown (already formatted), tagged with its SI value so that checks and scripts can
/// read it back without parsing the units: `<span class="num" id=… data-si="…">34.6 °C</span>`.
/// A non-finite SI value leaves `data-si` empty.
#[must_use]
pub fn num_span(id: Option<&str>, si: f64, shown: &str) -> String {
    let id = id.map_or_else(String::new, |i| format!(" id=\"{}\"", attr(i)));
    let si = if si.is_finite() {
        format!("{si}")
    } else {
        String::new()
    };
    format!(
        "<span class=\"num\"{id} data-si=\"{}\">{}</span>",
        attr(&si),
        esc(shown)
    )
}

/// One row of a two- or three-column table of quantities: name, value (HTML), note (text).
#[derive(Debug, Clone)]
pub struct Row {
    /// The quantity's name (text).
    pub name: String,
    /// The value, already HTML (use [`esc`] or [`num_span`]).
    pub value_html: String,
    /// A note: source, default, meaning (text; may be empty).
    pub note: String,
}

impl Row {
    /// A row from plain-text value.
    #[must_use]
    pub fn text(name: &str, value: &str, note: &str) -> Self {
        Self {
            name: name.to_owned(),
            value_html: esc(value),
            note: note.to_owned(),
        }
    }

    /// A row whose value is a tagged number.
    #[must_use]
    pub fn num(name: &str, id: Option<&str>, si: f64, shown: &str, note: &str) -> Self {
        Self {
            name: name.to_owned(),
            value_html: num_span(id, si, shown),
            note: note.to_owned(),
        }
    }
}

/// A table of quantities with a caption and the column heads "Quantity", "Value", "Note".
#[must_use]
pub fn quantity_table(id: &str, caption: &str, rows: &[Row]) -> String {
    let mut s = format!(
        "<table class=\"quantities\" id=\"{}\">\n<caption>{}</caption>\n<thead><tr><th scope=\"col\">Quantity</th><th scope=\"col\" class=\"value\">Value</th><th scope=\"col\">Note</th></tr></thead>\n<tbody>\n",
        attr(id),
        esc(caption)
    );
    for r in rows {
        s.push_str(&format!(
            "<tr><th scope=\"row\">{}</th><td class=\"value\">{}</td><td class=\"note\">{}</td></tr>\n",
            esc(&r.name),
            r.value_html,
            esc(&r.note)
        ));
    }
    s.push_str("</tbody>\n</table>\n");
    s
}

/// A table with a header row and text cells; columns listed in `numeric` are right-aligned.
#[must_use]
pub fn grid_table(
    id: &str,
    caption: &str,
    header: &[String],
    rows: &[Vec<String>],
    numeric: &[usize],
) -> String {
    let mut s = format!(
        "<table class=\"grid\" id=\"{}\">\n<caption>{}</caption>\n<thead><tr>",
        attr(id),
        esc(caption)
    );
    for (i, h) in header.iter().enumerate() {
        let class = if numeric.contains(&i) {
            " class=\"value\""
        } else {
            ""
        };
        s.push_str(&format!("<th scope=\"col\"{class}>{}</th>", esc(h)));
    }
    s.push_str("</tr></thead>\n<tbody>\n");
    for r in rows {
        s.push_str("<tr>");
        for (i, c) in r.iter().enumerate() {
            let class = if numeric.contains(&i) {
                " class=\"value\""
            } else {
                ""
            };
            s.push_str(&format!("<td{class}>{}</td>", esc(c)));
        }
        s.push_str("</tr>\n");
    }
    s.push_str("</tbody>\n</table>\n");
    s
}

/// A figure: the inline SVG, a caption and the CSV file that holds its data.
#[must_use]
pub fn figure(id: &str, svg: &str, caption: &str, csv_file: &str) -> String {
    format!(
        "<figure id=\"{}\">\n{svg}\n<figcaption>{} Data: <a href=\"{}\">{}</a>.</figcaption>\n</figure>\n",
        attr(id),
        esc(caption),
        attr(csv_file),
        esc(csv_file)
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_markup_and_quotes() {
        assert_eq!(esc("a < b & c"), "a &lt; b &amp; c");
        assert!(!attr("say \"hi\"").contains('"'));
        let s = num_span(Some("x"), f64::NAN, "—");
        assert!(s.contains("data-si=\"\"") && !s.contains("NaN"));
    }
}
