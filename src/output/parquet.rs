//! Parquet written straight from a table's columns, through polars' own
//! Parquet writer (polars-parquet) below the data-frame layer.
//!
//! Why not `polars::ParquetWriter` on a data frame: it builds every column
//! through a per-value option builder, estimates each float column's
//! cardinality (HyperLogLog) to try a dictionary that measured floats never
//! need, and computes min and max of every column. On the 200-well bench
//! field that was 25-30 % of a run (DEVELOPERS.md, "Speed"). Here:
//!
//! - each column is one copy of its slice, with a validity bitmap for NaN
//!   (a Parquet null);
//! - floats and integers are PLAIN-encoded; only a text column (the well
//!   name, the same on every row) is dictionary-encoded;
//! - min and max are written for the columns a reader filters on (the
//!   caller marks them: depth, well); null counts for every column;
//! - one row group per file, pages compressed with [`COMPRESSION`] (Snappy).
//!
//! The files read back in polars, pyarrow and DuckDB as before: the Arrow
//! schema stored in the footer is the same (String, Float64, Int64).

use std::io::Write;

use polars::prelude::PlSmallStr;
use polars_arrow::array::{Array, PrimitiveArray, Utf8ViewArray};
use polars_arrow::bitmap::Bitmap;
use polars_arrow::datatypes::{ArrowDataType, ArrowSchema, Field};
use polars_parquet::write::{
    CompressionOptions, Compressor, DynIter, DynStreamingIterator, Encoding,
    FallibleStreamingIterator, FileWriter, StatisticsOptions, Version, WriteOptions,
    array_to_columns, to_parquet_type,
};

/// The compression of every page: Snappy. Chosen by measurement on the
/// 200-well bench field (2 million rows of 17 columns; seconds of the field
/// table stage on one thread, and the folder's size):
///
/// | codec | seconds | MB |
/// |---|---|---|
/// | none | 0.26 | 126 |
/// | Snappy | 0.34 | 95 |
/// | LZ4 (raw) | 0.39 | 93 |
/// | zstd level 1 | 0.54 | 72 |
/// | zstd level 3 | 0.66 | 70 |
/// | before: polars' writer, zstd, dictionaries, min/max everywhere | 0.72-0.88 | 68 |
///
/// Measured logs compress poorly (noise in the low bits), so a slow codec
/// buys little; Snappy is the one every Parquet reader has had longest.
pub const COMPRESSION: CompressionOptions = CompressionOptions::Snappy;

/// What one Parquet column holds.
#[derive(Debug, Clone, Copy)]
pub enum Values<'a> {
    /// Floats; NaN is written as null.
    Float(&'a [f64]),
    /// Whole numbers carried as floats (classes, flags): rounded, written
    /// as 64-bit integers; NaN is written as null.
    Integer(&'a [f64]),
    /// One text on every row (the well name).
    Repeated(&'a str),
}

impl<'a> Values<'a> {
    /// A table column's values: whole numbers as integers, else floats.
    pub fn of(values: &'a [f64], integer: bool) -> Values<'a> {
        if integer {
            Values::Integer(values)
        } else {
            Values::Float(values)
        }
    }
}

/// One column to write.
#[derive(Debug, Clone, Copy)]
pub struct PqColumn<'a> {
    /// The column's name.
    pub name: &'a str,
    /// Its values.
    pub values: Values<'a>,
    /// Write min and max (for readers that skip files by value: depth, well).
    pub min_max: bool,
}

/// Write `columns`, `rows` rows each, as one Parquet file to `out`; returns
/// the bytes written.
pub fn write_columns(
    out: &mut impl Write,
    columns: &[PqColumn<'_>],
    rows: usize,
) -> polars::error::PolarsResult<u64> {
    let fields: Vec<Field> = columns
        .iter()
        .map(|c| {
            let dtype = match c.values {
                Values::Float(_) => ArrowDataType::Float64,
                Values::Integer(_) => ArrowDataType::Int64,
                Values::Repeated(_) => ArrowDataType::Utf8View,
            };
            Field::new(PlSmallStr::from_str(c.name), dtype, true)
        })
        .collect();
    let schema: ArrowSchema = fields
        .iter()
        .cloned()
        .map(|f| (f.name.clone(), f))
        .collect();
    let options = |min_max: bool| WriteOptions {
        statistics: StatisticsOptions {
            min_value: min_max,
            max_value: min_max,
            distinct_count: false,
            null_count: true,
            binary_statistics_truncate_length: None,
        },
        version: Version::V1,
        compression: COMPRESSION,
        data_page_size: None,
    };
    let mut writer = FileWriter::try_new(out, schema, options(false))?;
    let mut chunks = Vec::with_capacity(columns.len());
    for (c, field) in columns.iter().zip(&fields) {
        let (array, encoding) = array_of(c.values, rows);
        let type_ = to_parquet_type(field)?;
        let opts = options(c.min_max);
        for pages in array_to_columns(array.as_ref(), type_, opts, &[encoding])? {
            let pages = DynIter::new(pages.map(|p| {
                p.map_err(|e| {
                    polars_parquet::read::ParquetError::FeatureNotSupported(e.to_string())
                })
            }));
            let compressed = Compressor::new(pages, opts.compression, Vec::new())
                .map_err(polars::error::PolarsError::from);
            chunks.push(Ok(DynStreamingIterator::new(compressed)));
        }
    }
    writer.write(rows as u64, DynIter::new(chunks.into_iter()))?;
    writer.end(None)
}

/// The Arrow array of one column and its Parquet encoding.
fn array_of(values: Values<'_>, rows: usize) -> (Box<dyn Array>, Encoding) {
    match values {
        Values::Float(v) => {
            let array =
                PrimitiveArray::<f64>::new(ArrowDataType::Float64, v.to_vec().into(), validity(v));
            (array.boxed(), Encoding::Plain)
        }
        Values::Integer(v) => {
            let ints: Vec<i64> = v
                .iter()
                .map(|&x| if x.is_finite() { x.round() as i64 } else { 0 })
                .collect();
            let array = PrimitiveArray::<i64>::new(ArrowDataType::Int64, ints.into(), validity(v));
            (array.boxed(), Encoding::Plain)
        }
        Values::Repeated(text) => {
            let array = Utf8ViewArray::from_slice_values(vec![text; rows]);
            (array.boxed(), Encoding::RleDictionary)
        }
    }
}

/// The validity bitmap of a float column: NaN and infinities are nulls;
/// `None` when every value is valid.
fn validity(v: &[f64]) -> Option<Bitmap> {
    if v.iter().all(|x| x.is_finite()) {
        return None;
    }
    Some(v.iter().map(|x| x.is_finite()).collect())
}

#[cfg(test)]
mod tests {
    use super::*;
    use polars::prelude::{ParquetReader, SerReader};

    /// A file written here reads back in polars' own reader with the same
    /// names, types, values and nulls.
    #[test]
    fn columns_read_back_in_polars() {
        let depth = [1000.0, 1000.5, 1001.0, 1001.5];
        let sw = [0.25, f64::NAN, 1.0, 0.125];
        let class = [1.0, 2.0, f64::NAN, 4.0];
        let cols = [
            PqColumn {
                name: "WELL",
                values: Values::Repeated("Aster-1"),
                min_max: true,
            },
            PqColumn {
                name: "DEPTH",
                values: Values::Float(&depth),
                min_max: true,
            },
            PqColumn {
                name: "SW",
                values: Values::Float(&sw),
                min_max: false,
            },
            PqColumn {
                name: "CLASS",
                values: Values::Integer(&class),
                min_max: false,
            },
        ];
        let mut buf = Vec::new();
        let n = write_columns(&mut buf, &cols, 4).expect("written");
        assert_eq!(n as usize, buf.len());
        assert_eq!(&buf[..4], b"PAR1", "Parquet magic");
        let df = ParquetReader::new(std::io::Cursor::new(buf))
            .finish()
            .expect("reads");
        assert_eq!(df.shape(), (4, 4));
        let well = df.column("WELL").expect("WELL").str().expect("text");
        assert!((0..4).all(|i| well.get(i) == Some("Aster-1")));
        let d = df.column("DEPTH").expect("DEPTH").f64().expect("f64");
        assert_eq!(d.get(3), Some(1001.5));
        let s = df.column("SW").expect("SW").f64().expect("f64");
        assert_eq!(
            (s.get(0), s.get(1), s.get(3)),
            (Some(0.25), None, Some(0.125))
        );
        let c = df.column("CLASS").expect("CLASS").i64().expect("i64");
        assert_eq!((c.get(1), c.get(2), c.get(3)), (Some(2), None, Some(4)));
    }
}
