//! Scans split over a batch system: `scan --shard K/N` computes the K-th of N
//! interleaved parts of a grid (points K-1, K-1+N, ...), so that every part
//! gets its share of cheap and expensive couplings; `merge` joins the parts'
//! outputs into the output one unsplit scan would have printed, refusing
//! parts of different scans, parts given twice and parts missing.

use std::collections::BTreeMap;

use serde::{Deserialize, Serialize};

use crate::error::{Error, Result};

/// The K-th (from 1) of N parts.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Shard {
    pub index: usize,
    pub count: usize,
}

impl Shard {
    /// Reads `K/N`, 1 <= K <= N; a batch system's task number goes in as K.
    pub fn parse(text: &str) -> Result<Shard> {
        let bad = || {
            Error::input(format!(
                "--shard {text}: expected K/N with 1 <= K <= N, e.g. --shard 3/8 (the part K of N)"
            ))
        };
        let (k, n) = text.split_once('/').ok_or_else(bad)?;
        let index: usize = k.trim().parse().map_err(|_| bad())?;
        let count: usize = n.trim().parse().map_err(|_| bad())?;
        if index == 0 || count == 0 || index > count {
            return Err(bad());
        }
        Ok(Shard { index, count })
    }

    /// The grid indices of this part: K-1, K-1+N, ...
    pub fn points(&self, total: usize) -> Vec<usize> {
        (self.index - 1..total).step_by(self.count).collect()
    }
}

/// What identifies a scan: two parts merge only when all of it agrees.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ScanId {
    pub quantity: String,
    pub grid: String,
    pub digits: u32,
    pub points: usize,
}

/// One computed point, as printed.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ScanRow {
    pub g: String,
    pub value: String,
    pub error: String,
    /// The digits the error supports; JSON output only.
    #[serde(skip_serializing_if = "Option::is_none", default)]
    pub digits: Option<u32>,
}

/// A part's output in JSON.
#[derive(Serialize, Deserialize)]
pub struct ShardJson {
    pub shard: String,
    #[serde(flatten)]
    pub id: ScanId,
    pub rows: Vec<IndexedRow>,
}

#[derive(Serialize, Deserialize)]
pub struct IndexedRow {
    pub point: usize,
    #[serde(flatten)]
    pub row: ScanRow,
}

/// The first line of a part's CSV output.
pub fn csv_header(shard: Shard, id: &ScanId) -> String {
    format!(
        "# loopwise scan shard {}/{}: quantity {}; grid {}; {} points; {} digits",
        shard.index, shard.count, id.quantity, id.grid, id.points, id.digits
    )
}

/// The joined scan: its rows in grid order, and whether the parts were JSON.
pub struct Merged {
    pub json: bool,
    pub rows: Vec<ScanRow>,
}

struct Part {
    shard: Shard,
    id: ScanId,
    json: bool,
    rows: Vec<(usize, ScanRow)>,
}

/// Joins the outputs of `scan --shard`, given as (file name, text).
pub fn merge(files: &[(String, String)]) -> Result<Merged> {
    if files.is_empty() {
        return Err(Error::input(
            "merge needs the output files of `scan --shard`",
        ));
    }
    let parts = files
        .iter()
        .map(|(name, text)| read_part(text).map_err(|e| e.context(name)))
        .collect::<Result<Vec<_>>>()?;
    let first = &parts[0];
    let mut seen: BTreeMap<usize, &str> = BTreeMap::new();
    for (part, (name, _)) in parts.iter().zip(files) {
        if part.id != first.id || part.shard.count != first.shard.count || part.json != first.json {
            return Err(Error::input(format!(
                "{name}: part {}/{} of another scan than {} (quantity, grid, points, digits, number of parts and format must agree)",
                part.shard.index, part.shard.count, files[0].0
            )));
        }
        if let Some(other) = seen.insert(part.shard.index, name) {
            return Err(Error::input(format!(
                "{name}: part {}/{} is also given as {other}; the parts overlap",
                part.shard.index, part.shard.count
            )));
        }
    }
    let missing: Vec<String> = (1..=first.shard.count)
        .filter(|k| !seen.contains_key(k))
        .map(|k| format!("{k}/{}", first.shard.count))
        .collect();
    if !missing.is_empty() {
        return Err(Error::input(format!(
            "parts missing: {}; every part of the scan is needed",
            missing.join(", ")
        )));
    }
    let mut rows: Vec<Option<ScanRow>> = vec![None; first.id.points];
    for (part, (name, _)) in parts.iter().zip(files) {
        let expected = part.shard.points(part.id.points);
        let got: Vec<usize> = part.rows.iter().map(|(i, _)| *i).collect();
        if got != expected {
            return Err(Error::input(format!(
                "{name}: part {}/{} holds points {got:?}, not the part's points {expected:?}",
                part.shard.index, part.shard.count
            )));
        }
        for (i, row) in &part.rows {
            rows[*i] = Some(row.clone());
        }
    }
    Ok(Merged {
        json: first.json,
        rows: rows.into_iter().flatten().collect(),
    })
}

fn read_part(text: &str) -> Result<Part> {
    if text.trim_start().starts_with('{') {
        let j: ShardJson = serde_json::from_str(text)
            .map_err(|e| Error::input(format!("not the JSON output of `scan --shard`: {e}")))?;
        return Ok(Part {
            shard: Shard::parse(&j.shard)?,
            id: j.id,
            json: true,
            rows: j.rows.into_iter().map(|r| (r.point, r.row)).collect(),
        });
    }
    let mut lines = text.lines();
    let not_ours = || Error::input("not the output of `scan --shard` (its first line is missing)");
    let header = lines
        .next()
        .and_then(|l| l.strip_prefix("# loopwise scan shard "))
        .ok_or_else(not_ours)?;
    let (shard, rest) = header.split_once(": quantity ").ok_or_else(not_ours)?;
    let fields: Vec<&str> = rest.rsplitn(4, "; ").collect();
    let [digits, points, grid, quantity] = fields[..] else {
        return Err(not_ours());
    };
    let number = |s: Option<&str>| {
        s.and_then(|s| s.trim().parse::<usize>().ok())
            .ok_or_else(not_ours)
    };
    let id = ScanId {
        quantity: quantity.to_string(),
        grid: grid.strip_prefix("grid ").ok_or_else(not_ours)?.to_string(),
        points: number(points.strip_suffix(" points"))?,
        digits: u32::try_from(number(digits.strip_suffix(" digits"))?).map_err(|_| not_ours())?,
    };
    if lines.next() != Some("point,g,value,error") {
        return Err(Error::input(
            "the CSV columns of `scan --shard` are point,g,value,error",
        ));
    }
    let mut rows = Vec::new();
    for (n, line) in lines.enumerate() {
        let cells: Vec<&str> = line.split(',').collect();
        let [point, g, value, error] = cells[..] else {
            return Err(Error::input(format!(
                "line {}: expected four cells point,g,value,error",
                n + 3
            )));
        };
        let point = point
            .parse()
            .map_err(|_| Error::input(format!("line {}: `{point}` is not a point index", n + 3)))?;
        rows.push((
            point,
            ScanRow {
                g: g.to_string(),
                value: value.to_string(),
                error: error.to_string(),
                digits: None,
            },
        ));
    }
    Ok(Part {
        shard: Shard::parse(shard)?,
        id,
        json: false,
        rows,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parts_interleave_and_cover_the_grid_once() {
        let parts: Vec<Vec<usize>> = (1..=3)
            .map(|k| Shard { index: k, count: 3 }.points(8))
            .collect();
        assert_eq!(parts, [vec![0, 3, 6], vec![1, 4, 7], vec![2, 5]]);
        assert!(Shard::parse("0/4").is_err());
        assert!(Shard::parse("5/4").is_err());
        assert!(Shard::parse("4").is_err());
        assert_eq!(Shard::parse("2/4").unwrap(), Shard { index: 2, count: 4 });
    }
}
