// Package netcdf writes and reads NetCDF files in the classic format
// (CDF-1, [Classic]) and the 64-bit offset format (CDF-2, [Offset64]),
// following Unidata's published format specification. It is pure Go and
// uses only the standard library.
//
// A file is described by a [Header]: its [Format], dimensions ([Dim]),
// global attributes ([Attr]) and variables ([Var]) of the six classic
// types ([Byte], [Char], [Short], [Int], [Float], [Double]). A dimension
// of length 0 is the record (unlimited) dimension; variables whose first
// dimension it is are record variables and grow one record at a time.
//
// [Create] validates a Header completely before it writes anything (names,
// dimensions, attribute types, the formats' size and offset limits) and
// returns a [Writer]. Fixed-size variables are written whole
// ([Writer.WriteFloat64], [Writer.WriteVar]) and hold their fill values
// until then. Records are written variable by variable
// ([Writer.WriteRecordFloat64], [Writer.WriteRecord]) and made part of the
// file by [Writer.CommitRecord], which updates the header's record count
// only after the record's data is in the file: a writer killed at any
// instant leaves a file that ncdump and [Open] read up to its last
// committed record. [Append] reopens such a file to add records.
//
// [Open] and [Decode] read a file's header into a [File] and check that
// every variable's data lies within the file and overlaps no other's; [File.ReadFloat64],
// [File.ReadRecordFloat64], [File.ReadVar] and [File.ReadRecord] read
// values. The reader is meant for untrusted input: every count and offset
// is checked against the file's size before anything is allocated, and
// malformed files give a [*FormatError] with the byte offset of the
// problem. A record count marked as streaming is computed from the file's
// size.
//
// Not covered: the NetCDF-4 (HDF5) format, the CDF-5 format and its
// unsigned and 64-bit integer types, unlimited dimensions other than the
// first, variables over 2 GiB in the classic format (which allows one, if
// it is the last: use Offset64), non-ASCII names (the format requires NFC-normalised UTF-8, which
// the standard library cannot produce), reading or writing hyperslabs
// smaller than a whole variable or record, and interpreting _FillValue,
// scale_factor or other conventions when reading (values are returned as
// stored).
package netcdf
