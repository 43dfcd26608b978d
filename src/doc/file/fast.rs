//! A fast reader for project files as Tinct writes them: a `serde` deserializer over the part of
//! RON that the project format uses (structs, tuples, lists, maps, options, enums, strings,
//! numbers, booleans). It reads a million-region project several times faster than the general
//! RON parser.
//!
//! It is only a shortcut: on anything it does not understand (comments, raw strings, a syntax
//! error) it gives up, and the caller parses the text again with the `ron` crate, which reports
//! the problem with its line and column. So the two can never disagree about a valid file
//! except in speed, and a test holds them equal on every file the tests write.

use serde::de::value::BorrowedStrDeserializer;
use serde::de::{self, DeserializeSeed, MapAccess, SeqAccess, Visitor};

/// Why the shortcut gave up (never shown to users: the general parser takes over).
#[derive(Debug)]
pub struct GiveUp(String);

impl std::fmt::Display for GiveUp {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

impl std::error::Error for GiveUp {}

impl de::Error for GiveUp {
    fn custom<T: std::fmt::Display>(msg: T) -> GiveUp {
        GiveUp(msg.to_string())
    }
}

type Result<T> = std::result::Result<T, GiveUp>;

fn give_up<T>(what: &str) -> Result<T> {
    Err(GiveUp(what.to_string()))
}

/// Reads a `T` from the whole of `text`.
pub fn from_str<'de, T: serde::Deserialize<'de>>(text: &'de str) -> Result<T> {
    let mut de = Reader {
        bytes: text.as_bytes(),
        text,
        at: 0,
    };
    let value = T::deserialize(&mut de)?;
    de.skip_ws();
    if de.at != de.bytes.len() {
        return give_up("text after the value");
    }
    Ok(value)
}

struct Reader<'de> {
    bytes: &'de [u8],
    text: &'de str,
    at: usize,
}

impl<'de> Reader<'de> {
    #[inline]
    fn skip_ws(&mut self) {
        while let Some(b) = self.bytes.get(self.at) {
            if b.is_ascii_whitespace() {
                self.at += 1;
            } else {
                break;
            }
        }
    }

    #[inline]
    fn peek(&mut self) -> Option<u8> {
        self.skip_ws();
        self.bytes.get(self.at).copied()
    }

    #[inline]
    fn eat(&mut self, b: u8) -> bool {
        if self.peek() == Some(b) {
            self.at += 1;
            true
        } else {
            false
        }
    }

    fn expect(&mut self, b: u8) -> Result<()> {
        if self.eat(b) {
            Ok(())
        } else {
            give_up("unexpected character")
        }
    }

    /// An identifier (field or variant name).
    fn ident(&mut self) -> Result<&'de str> {
        self.skip_ws();
        let start = self.at;
        while let Some(b) = self.bytes.get(self.at) {
            if b.is_ascii_alphanumeric() || *b == b'_' {
                self.at += 1;
            } else {
                break;
            }
        }
        if self.at == start {
            return give_up("expected a name");
        }
        Ok(&self.text[start..self.at])
    }

    /// The text of a number (digits, sign, point, exponent), or `inf` / `NaN`.
    fn number_text(&mut self) -> Result<&'de str> {
        self.skip_ws();
        let start = self.at;
        while let Some(b) = self.bytes.get(self.at) {
            if b.is_ascii_digit() || matches!(b, b'-' | b'+' | b'.' | b'e' | b'E') {
                self.at += 1;
            } else {
                break;
            }
        }
        let rest = &self.text[self.at..];
        for word in ["inf", "NaN"] {
            if rest.starts_with(word) {
                self.at += word.len();
            }
        }
        if self.at == start {
            return give_up("expected a number");
        }
        Ok(&self.text[start..self.at])
    }

    fn float(&mut self) -> Result<f64> {
        let t = self.number_text()?;
        t.parse::<f64>().or_else(|_| give_up("not a number"))
    }

    fn unsigned(&mut self) -> Result<u64> {
        let t = self.number_text()?;
        t.parse::<u64>().or_else(|_| give_up("not a whole number"))
    }

    fn signed(&mut self) -> Result<i64> {
        let t = self.number_text()?;
        t.parse::<i64>().or_else(|_| give_up("not a whole number"))
    }

    /// A string: borrowed when it has no escapes.
    fn string(&mut self) -> Result<std::borrow::Cow<'de, str>> {
        self.expect(b'"')?;
        let start = self.at;
        // Fast path: no escapes before the closing quote.
        while let Some(&b) = self.bytes.get(self.at) {
            match b {
                b'"' => {
                    let s = &self.text[start..self.at];
                    self.at += 1;
                    return Ok(std::borrow::Cow::Borrowed(s));
                }
                b'\\' => break,
                _ => self.at += 1,
            }
        }
        let mut out = String::from(&self.text[start..self.at]);
        loop {
            let Some(&b) = self.bytes.get(self.at) else {
                return give_up("unterminated string");
            };
            match b {
                b'"' => {
                    self.at += 1;
                    return Ok(std::borrow::Cow::Owned(out));
                }
                b'\\' => {
                    self.at += 1;
                    let Some(&e) = self.bytes.get(self.at) else {
                        return give_up("unterminated escape");
                    };
                    self.at += 1;
                    match e {
                        b'"' => out.push('"'),
                        b'\\' => out.push('\\'),
                        b'\'' => out.push('\''),
                        b'n' => out.push('\n'),
                        b'r' => out.push('\r'),
                        b't' => out.push('\t'),
                        b'0' => out.push('\0'),
                        b'u' => {
                            if self.bytes.get(self.at) != Some(&b'{') {
                                return give_up("unusual escape");
                            }
                            let close = self.text[self.at..]
                                .find('}')
                                .map(|i| self.at + i)
                                .ok_or_else(|| GiveUp("unterminated escape".into()))?;
                            let code = u32::from_str_radix(&self.text[self.at + 1..close], 16)
                                .ok()
                                .and_then(char::from_u32)
                                .ok_or_else(|| GiveUp("bad escape".into()))?;
                            out.push(code);
                            self.at = close + 1;
                        }
                        b'x' => {
                            let hex = self
                                .text
                                .get(self.at..self.at + 2)
                                .and_then(|h| u8::from_str_radix(h, 16).ok())
                                .filter(|v| v.is_ascii())
                                .ok_or_else(|| GiveUp("bad escape".into()))?;
                            out.push(char::from(hex));
                            self.at += 2;
                        }
                        _ => return give_up("unusual escape"),
                    }
                }
                _ => {
                    // Copy a run of ordinary characters at once (UTF-8 stays whole: the run
                    // ends only at an ASCII quote or backslash).
                    let run_start = self.at;
                    while let Some(&c) = self.bytes.get(self.at) {
                        if c == b'"' || c == b'\\' {
                            break;
                        }
                        self.at += 1;
                    }
                    out.push_str(&self.text[run_start..self.at]);
                }
            }
        }
    }

    /// After an element of a list, tuple or struct: a comma, or the closing bracket.
    fn more(&mut self, close: u8) -> Result<bool> {
        if self.eat(b',') {
            Ok(self.peek() != Some(close))
        } else if self.peek() == Some(close) {
            Ok(false)
        } else {
            give_up("expected a comma")
        }
    }
}

impl<'de> de::Deserializer<'de> for &mut Reader<'de> {
    type Error = GiveUp;

    fn deserialize_any<V: Visitor<'de>>(self, _visitor: V) -> Result<V::Value> {
        give_up("untyped value")
    }

    fn deserialize_bool<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        match self.ident()? {
            "true" => visitor.visit_bool(true),
            "false" => visitor.visit_bool(false),
            _ => give_up("expected true or false"),
        }
    }

    fn deserialize_i8<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_i64(visitor)
    }
    fn deserialize_i16<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_i64(visitor)
    }
    fn deserialize_i32<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_i64(visitor)
    }
    fn deserialize_i64<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        visitor.visit_i64(self.signed()?)
    }
    fn deserialize_u8<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_u64(visitor)
    }
    fn deserialize_u16<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_u64(visitor)
    }
    fn deserialize_u32<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_u64(visitor)
    }
    fn deserialize_u64<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        visitor.visit_u64(self.unsigned()?)
    }
    fn deserialize_f32<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_f64(visitor)
    }
    fn deserialize_f64<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        visitor.visit_f64(self.float()?)
    }
    fn deserialize_char<V: Visitor<'de>>(self, _visitor: V) -> Result<V::Value> {
        give_up("characters are not used")
    }
    fn deserialize_str<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        match self.string()? {
            std::borrow::Cow::Borrowed(s) => visitor.visit_borrowed_str(s),
            std::borrow::Cow::Owned(s) => visitor.visit_string(s),
        }
    }
    fn deserialize_string<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.deserialize_str(visitor)
    }
    fn deserialize_bytes<V: Visitor<'de>>(self, _visitor: V) -> Result<V::Value> {
        give_up("bytes are not used")
    }
    fn deserialize_byte_buf<V: Visitor<'de>>(self, _visitor: V) -> Result<V::Value> {
        give_up("bytes are not used")
    }
    fn deserialize_option<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        match self.ident()? {
            "None" => visitor.visit_none(),
            "Some" => {
                self.expect(b'(')?;
                let value = visitor.visit_some(&mut *self)?;
                self.eat(b',');
                self.expect(b')')?;
                Ok(value)
            }
            _ => give_up("expected Some or None"),
        }
    }
    fn deserialize_unit<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.expect(b'(')?;
        self.expect(b')')?;
        visitor.visit_unit()
    }
    fn deserialize_unit_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        visitor: V,
    ) -> Result<V::Value> {
        self.deserialize_unit(visitor)
    }
    fn deserialize_newtype_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        visitor: V,
    ) -> Result<V::Value> {
        visitor.visit_newtype_struct(self)
    }
    fn deserialize_seq<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.expect(b'[')?;
        let value = visitor.visit_seq(Elements {
            de: self,
            close: b']',
            first: true,
        })?;
        self.expect(b']')?;
        Ok(value)
    }
    fn deserialize_tuple<V: Visitor<'de>>(self, _len: usize, visitor: V) -> Result<V::Value> {
        self.expect(b'(')?;
        let value = visitor.visit_seq(Elements {
            de: self,
            close: b')',
            first: true,
        })?;
        self.expect(b')')?;
        Ok(value)
    }
    fn deserialize_tuple_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        len: usize,
        visitor: V,
    ) -> Result<V::Value> {
        self.deserialize_tuple(len, visitor)
    }
    fn deserialize_map<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        self.expect(b'{')?;
        let value = visitor.visit_map(Entries {
            de: self,
            close: b'}',
            named: false,
            first: true,
        })?;
        self.expect(b'}')?;
        Ok(value)
    }
    fn deserialize_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        _fields: &'static [&'static str],
        visitor: V,
    ) -> Result<V::Value> {
        self.expect(b'(')?;
        let value = visitor.visit_map(Entries {
            de: self,
            close: b')',
            named: true,
            first: true,
        })?;
        self.expect(b')')?;
        Ok(value)
    }
    fn deserialize_enum<V: Visitor<'de>>(
        self,
        _name: &'static str,
        _variants: &'static [&'static str],
        visitor: V,
    ) -> Result<V::Value> {
        visitor.visit_enum(Variant { de: self })
    }
    fn deserialize_identifier<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value> {
        visitor.visit_borrowed_str(self.ident()?)
    }
    fn deserialize_ignored_any<V: Visitor<'de>>(self, _visitor: V) -> Result<V::Value> {
        give_up("unknown content")
    }
}

struct Elements<'a, 'de> {
    de: &'a mut Reader<'de>,
    close: u8,
    first: bool,
}

impl<'de> SeqAccess<'de> for Elements<'_, 'de> {
    type Error = GiveUp;
    fn next_element_seed<T: DeserializeSeed<'de>>(&mut self, seed: T) -> Result<Option<T::Value>> {
        let go_on = if self.first {
            self.first = false;
            self.de.peek() != Some(self.close)
        } else {
            self.de.more(self.close)?
        };
        if go_on {
            seed.deserialize(&mut *self.de).map(Some)
        } else {
            Ok(None)
        }
    }
}

struct Entries<'a, 'de> {
    de: &'a mut Reader<'de>,
    close: u8,
    /// Struct fields are bare names; map keys are values.
    named: bool,
    first: bool,
}

impl<'de> MapAccess<'de> for Entries<'_, 'de> {
    type Error = GiveUp;
    fn next_key_seed<K: DeserializeSeed<'de>>(&mut self, seed: K) -> Result<Option<K::Value>> {
        let go_on = if self.first {
            self.first = false;
            self.de.peek() != Some(self.close)
        } else {
            self.de.more(self.close)?
        };
        if !go_on {
            return Ok(None);
        }
        let key = if self.named {
            let name = self.de.ident()?;
            seed.deserialize(BorrowedStrDeserializer::<GiveUp>::new(name))?
        } else {
            seed.deserialize(&mut *self.de)?
        };
        self.de.expect(b':')?;
        Ok(Some(key))
    }
    fn next_value_seed<V: DeserializeSeed<'de>>(&mut self, seed: V) -> Result<V::Value> {
        seed.deserialize(&mut *self.de)
    }
}

struct Variant<'a, 'de> {
    de: &'a mut Reader<'de>,
}

impl<'de> de::EnumAccess<'de> for Variant<'_, 'de> {
    type Error = GiveUp;
    type Variant = Self;
    fn variant_seed<V: DeserializeSeed<'de>>(self, seed: V) -> Result<(V::Value, Self)> {
        let name = self.de.ident()?;
        let value = seed.deserialize(BorrowedStrDeserializer::<GiveUp>::new(name))?;
        Ok((value, self))
    }
}

impl<'de> de::VariantAccess<'de> for Variant<'_, 'de> {
    type Error = GiveUp;
    fn unit_variant(self) -> Result<()> {
        Ok(())
    }
    fn newtype_variant_seed<T: DeserializeSeed<'de>>(self, seed: T) -> Result<T::Value> {
        self.de.expect(b'(')?;
        let value = seed.deserialize(&mut *self.de)?;
        self.de.eat(b',');
        self.de.expect(b')')?;
        Ok(value)
    }
    fn tuple_variant<V: Visitor<'de>>(self, len: usize, visitor: V) -> Result<V::Value> {
        de::Deserializer::deserialize_tuple(self.de, len, visitor)
    }
    fn struct_variant<V: Visitor<'de>>(
        self,
        fields: &'static [&'static str],
        visitor: V,
    ) -> Result<V::Value> {
        de::Deserializer::deserialize_struct(self.de, "", fields, visitor)
    }
}
