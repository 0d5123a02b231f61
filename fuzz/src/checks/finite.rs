//! Finds every NaN or infinite `f64`/`f32` inside any `Serialize` value, by path.
//!
//! serde_json writes a NaN as `null`, the same as `None`, so it cannot tell "no value"
//! from "a broken value". This serializer visits the value instead and records the path
//! of each non-finite float (`lots[0].cpk`).

use serde::ser::{self, Serialize};
use std::fmt;

/// The paths of every non-finite float in `value`, empty when all are finite.
pub fn non_finite_paths<T: Serialize + ?Sized>(value: &T) -> Vec<String> {
    let mut walker = Walker::default();
    // The walker never fails; an Err could only come from a Serialize impl's own custom
    // error, which is recorded as a finding too.
    if let Err(error) = value.serialize(&mut walker) {
        walker.found.push(format!("<serialize failed: {error}>"));
    }
    walker.found
}

#[derive(Default)]
struct Walker {
    path: Vec<String>,
    found: Vec<String>,
}

impl Walker {
    fn float(&mut self, value: f64) {
        if !value.is_finite() {
            let path = self.path.join("");
            let path = match path.strip_prefix('.') {
                Some(field) => field.to_owned(),
                None if path.is_empty() => "<root>".to_owned(),
                None => path,
            };
            self.found.push(format!("{path} = {value}"));
        }
    }

    fn nested<T: Serialize + ?Sized>(&mut self, step: String, value: &T) -> Result<(), Error> {
        self.path.push(step);
        let result = value.serialize(&mut *self);
        self.path.pop();
        result
    }
}

/// The walker's error type (only a `Serialize` impl's own custom error can raise it).
#[derive(Debug)]
pub struct Error(String);

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

impl std::error::Error for Error {}

impl ser::Error for Error {
    fn custom<T: fmt::Display>(msg: T) -> Self {
        Error(msg.to_string())
    }
}

/// Sequences, tuples, maps and structs: counts elements for the path.
struct Compound<'w> {
    walker: &'w mut Walker,
    index: usize,
    key: String,
}

macro_rules! ignore_scalars {
    ($($method:ident: $ty:ty),* $(,)?) => {
        $(fn $method(self, _: $ty) -> Result<(), Error> { Ok(()) })*
    };
}

impl<'w> ser::Serializer for &'w mut Walker {
    type Ok = ();
    type Error = Error;
    type SerializeSeq = Compound<'w>;
    type SerializeTuple = Compound<'w>;
    type SerializeTupleStruct = Compound<'w>;
    type SerializeTupleVariant = Compound<'w>;
    type SerializeMap = Compound<'w>;
    type SerializeStruct = Compound<'w>;
    type SerializeStructVariant = Compound<'w>;

    ignore_scalars!(
        serialize_bool: bool, serialize_i8: i8, serialize_i16: i16, serialize_i32: i32,
        serialize_i64: i64, serialize_u8: u8, serialize_u16: u16, serialize_u32: u32,
        serialize_u64: u64, serialize_char: char, serialize_str: &str, serialize_bytes: &[u8],
    );

    fn serialize_f32(self, v: f32) -> Result<(), Error> {
        self.float(f64::from(v));
        Ok(())
    }
    fn serialize_f64(self, v: f64) -> Result<(), Error> {
        self.float(v);
        Ok(())
    }
    fn serialize_none(self) -> Result<(), Error> {
        Ok(())
    }
    fn serialize_some<T: Serialize + ?Sized>(self, value: &T) -> Result<(), Error> {
        value.serialize(self)
    }
    fn serialize_unit(self) -> Result<(), Error> {
        Ok(())
    }
    fn serialize_unit_struct(self, _: &'static str) -> Result<(), Error> {
        Ok(())
    }
    fn serialize_unit_variant(self, _: &'static str, _: u32, _: &'static str) -> Result<(), Error> {
        Ok(())
    }
    fn serialize_newtype_struct<T: Serialize + ?Sized>(
        self,
        _: &'static str,
        value: &T,
    ) -> Result<(), Error> {
        value.serialize(self)
    }
    fn serialize_newtype_variant<T: Serialize + ?Sized>(
        self,
        _: &'static str,
        _: u32,
        variant: &'static str,
        value: &T,
    ) -> Result<(), Error> {
        self.nested(format!("::{variant}"), value)
    }
    fn serialize_seq(self, _: Option<usize>) -> Result<Compound<'w>, Error> {
        Ok(self.compound())
    }
    fn serialize_tuple(self, _: usize) -> Result<Compound<'w>, Error> {
        Ok(self.compound())
    }
    fn serialize_tuple_struct(self, _: &'static str, _: usize) -> Result<Compound<'w>, Error> {
        Ok(self.compound())
    }
    fn serialize_tuple_variant(
        self,
        _: &'static str,
        _: u32,
        _: &'static str,
        _: usize,
    ) -> Result<Compound<'w>, Error> {
        Ok(self.compound())
    }
    fn serialize_map(self, _: Option<usize>) -> Result<Compound<'w>, Error> {
        Ok(self.compound())
    }
    fn serialize_struct(self, _: &'static str, _: usize) -> Result<Compound<'w>, Error> {
        Ok(self.compound())
    }
    fn serialize_struct_variant(
        self,
        _: &'static str,
        _: u32,
        _: &'static str,
        _: usize,
    ) -> Result<Compound<'w>, Error> {
        Ok(self.compound())
    }
}

impl<'w> Walker {
    fn compound(&'w mut self) -> Compound<'w> {
        Compound {
            walker: self,
            index: 0,
            key: String::new(),
        }
    }
}

impl Compound<'_> {
    fn element<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        let step = format!("[{}]", self.index);
        self.index += 1;
        self.walker.nested(step, value)
    }

    fn field<T: Serialize + ?Sized>(&mut self, name: &str, value: &T) -> Result<(), Error> {
        self.walker.nested(format!(".{name}"), value)
    }
}

impl ser::SerializeSeq for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_element<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        self.element(value)
    }
    fn end(self) -> Result<(), Error> {
        Ok(())
    }
}

impl ser::SerializeTuple for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_element<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        self.element(value)
    }
    fn end(self) -> Result<(), Error> {
        Ok(())
    }
}

impl ser::SerializeTupleStruct for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        self.element(value)
    }
    fn end(self) -> Result<(), Error> {
        Ok(())
    }
}

impl ser::SerializeTupleVariant for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        self.element(value)
    }
    fn end(self) -> Result<(), Error> {
        Ok(())
    }
}

impl ser::SerializeMap for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_key<T: Serialize + ?Sized>(&mut self, key: &T) -> Result<(), Error> {
        // Keys are labels here (strings, ids); a float key would be checked as a value.
        self.key = format!("[{}]", self.index);
        self.walker.nested(self.key.clone(), key)
    }
    fn serialize_value<T: Serialize + ?Sized>(&mut self, value: &T) -> Result<(), Error> {
        self.index += 1;
        let step = std::mem::take(&mut self.key);
        self.walker.nested(step, value)
    }
    fn end(self) -> Result<(), Error> {
        Ok(())
    }
}

impl ser::SerializeStruct for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(
        &mut self,
        name: &'static str,
        value: &T,
    ) -> Result<(), Error> {
        self.field(name, value)
    }
    fn end(self) -> Result<(), Error> {
        Ok(())
    }
}

impl ser::SerializeStructVariant for Compound<'_> {
    type Ok = ();
    type Error = Error;
    fn serialize_field<T: Serialize + ?Sized>(
        &mut self,
        name: &'static str,
        value: &T,
    ) -> Result<(), Error> {
        self.field(name, value)
    }
    fn end(self) -> Result<(), Error> {
        Ok(())
    }
}
