//! The raw layer of a series file: what serde_yaml hands over, with every
//! scalar kept as text (never through a binary float) and, where serde_yaml
//! lends it straight out of the file, its position.

use super::*;

/// A scalar exactly as written. When serde_yaml can lend the text straight
/// out of the file (plain and simply quoted scalars), its address tells where
/// it sits.
#[derive(Debug)]
pub(super) enum Tok<'de> {
    Lent(&'de str),
    Copied(String),
}

impl Tok<'_> {
    pub(super) fn text(&self) -> &str {
        match self {
            Tok::Lent(s) => s,
            Tok::Copied(s) => s,
        }
    }

    /// Byte offset in `file`, when the text was lent from it.
    pub(super) fn offset_in(&self, file: &str) -> Option<usize> {
        match self {
            Tok::Lent(s) => {
                let at = (s.as_ptr() as usize).checked_sub(file.as_ptr() as usize)?;
                (at + s.len() <= file.len()).then_some(at)
            }
            Tok::Copied(_) => None,
        }
    }
}

impl<'de> Deserialize<'de> for Tok<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = Tok<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("a single value (text or a number)")
            }
            fn visit_borrowed_str<E: de::Error>(
                self,
                v: &'de str,
            ) -> std::result::Result<Tok<'de>, E> {
                Ok(Tok::Lent(v))
            }
            fn visit_str<E: de::Error>(self, v: &str) -> std::result::Result<Tok<'de>, E> {
                Ok(Tok::Copied(v.to_string()))
            }
        }
        // Asking for a string makes serde_yaml hand over the scalar's text,
        // so `value: -1240.9` never becomes a binary float.
        d.deserialize_str(V)
    }
}

#[derive(Debug)]
pub(super) enum RawField<'de> {
    Scalar(Tok<'de>),
    Symbols(Vec<Tok<'de>>),
    About(Vec<(Tok<'de>, serde_yaml::Value)>),
    Orders(Vec<RawOrder<'de>>),
    Unknown,
}

#[derive(Debug)]
pub(super) struct RawFile<'de> {
    pub(super) fields: Vec<(Tok<'de>, RawField<'de>)>,
}

/// The keys of one order entry, in file order; `None` for an unknown key.
#[derive(Debug)]
pub(super) struct RawOrder<'de> {
    pub(super) fields: Vec<(Tok<'de>, Option<Tok<'de>>)>,
}

impl<'de> Deserialize<'de> for RawFile<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = RawFile<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("a series file: keys such as `coupling:` and `orders:`")
            }
            fn visit_map<A: MapAccess<'de>>(
                self,
                mut map: A,
            ) -> std::result::Result<RawFile<'de>, A::Error> {
                let mut fields = Vec::new();
                while let Some(key) = map.next_key::<Tok<'de>>()? {
                    let field = match key.text() {
                        "prediction" | "coupling" | "normalisation" => {
                            RawField::Scalar(map.next_value()?)
                        }
                        "symbols" => RawField::Symbols(map.next_value()?),
                        "about" => RawField::About(map.next_value::<AboutMap<'de>>()?.0),
                        "orders" => RawField::Orders(map.next_value()?),
                        _ => {
                            map.next_value::<IgnoredAny>()?;
                            RawField::Unknown
                        }
                    };
                    fields.push((key, field));
                }
                Ok(RawFile { fields })
            }
        }
        d.deserialize_map(V)
    }
}

pub(super) struct AboutMap<'de>(pub(super) Vec<(Tok<'de>, serde_yaml::Value)>);

impl<'de> Deserialize<'de> for AboutMap<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = AboutMap<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("free-form `key: value` lines")
            }
            fn visit_map<A: MapAccess<'de>>(
                self,
                mut map: A,
            ) -> std::result::Result<AboutMap<'de>, A::Error> {
                let mut out = Vec::new();
                while let Some(key) = map.next_key::<Tok<'de>>()? {
                    out.push((key, map.next_value()?));
                }
                Ok(AboutMap(out))
            }
        }
        d.deserialize_map(V)
    }
}

impl<'de> Deserialize<'de> for RawOrder<'de> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> std::result::Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = RawOrder<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("an order entry: `loop:` with `exact:` and/or `value:`")
            }
            fn visit_map<A: MapAccess<'de>>(
                self,
                mut map: A,
            ) -> std::result::Result<RawOrder<'de>, A::Error> {
                let mut fields = Vec::new();
                while let Some(key) = map.next_key::<Tok<'de>>()? {
                    let value = if ORDER_KEYS.contains(&key.text()) {
                        Some(map.next_value()?)
                    } else {
                        map.next_value::<IgnoredAny>()?;
                        None
                    };
                    fields.push((key, value));
                }
                Ok(RawOrder { fields })
            }
        }
        d.deserialize_map(V)
    }
}
