package survey

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"io"
)

// csvStream reads CSV records one at a time without keeping them, with the
// conventions of ParseCSV: a byte-order mark is dropped, lines starting
// with '#' are comments, blank records are skipped, fields are trimmed, and
// Excel's separator hint "sep=," on the first line is skipped (a hint of
// another separator is refused). Text that is not a UTF-8 table is
// refused as ParseCSV refuses it (see sniffText): what the head of the
// file shows (a workbook, UTF-16, binary data, tabs) at the first record,
// a byte of another encoding at its line and field, carriage returns
// alone at the first line. A record longer than MaxLineBytes (a line, or
// the lines a quoted cell joins) is refused as it is read (ErrLongLine).
// A line without a quote is split at its commas in place; a record with
// quotes is handed to encoding/csv, so quoting follows RFC 4180 exactly.
// The fields returned are valid until the next call.
type csvStream struct {
	br     *bufio.Reader
	name   string
	line   int      // lines read so far
	long   []byte   // a line longer than the reader's buffer
	fields [][]byte // the current record's fields
	// quoted says which of the current record's fields were quoted (nil
	// when none was).
	quotedFields []bool
	queue        []queued // records of a quoted chunk not yet returned
	// meta holds the "# key: value" lines (see MetaKeys) above the first
	// record; started is set once a record has been returned.
	meta    map[string]string
	started bool
	// err is what the head of the file showed, returned by next.
	err error
	// header names the fields of the table's records, once its reader
	// knows them, for messages.
	header []string
}

// queued is a record parsed by encoding/csv from a quoted chunk.
type queued struct {
	line   int
	fields [][]byte
	quoted []bool
}

// csvBufferSize is the read buffer of a streamed CSV file.
const csvBufferSize = 256 << 10

func newCSVStream(r io.Reader, name string) *csvStream {
	br := bufio.NewReaderSize(r, csvBufferSize)
	if bom, err := br.Peek(3); err == nil && string(bom) == "\ufeff" {
		br.Discard(3)
	}
	c := &csvStream{br: br, name: name}
	head, _ := br.Peek(sniffBytes)
	if c.err = sniffKind(head, name); c.err == nil {
		c.err = tabbedHead(head, name)
	}
	return c
}

// readLine returns the next line without its line ending ("\n", "\r\n",
// or a final "\r" at the end of input), io.EOF after the last.
func (c *csvStream) readLine() ([]byte, error) {
	line, err := c.br.ReadSlice('\n')
	if err == bufio.ErrBufferFull {
		c.long = append(c.long[:0], line...)
		for err == bufio.ErrBufferFull {
			if len(c.long) > MaxLineBytes {
				return nil, longLineError(c.name, c.line+1)
			}
			line, err = c.br.ReadSlice('\n')
			c.long = append(c.long, line...)
		}
		if len(bytes.TrimRight(c.long, "\r\n")) > MaxLineBytes {
			return nil, longLineError(c.name, c.line+1)
		}
		line = c.long
	}
	if err != nil && err != io.EOF {
		return nil, err
	}
	if len(line) == 0 && err == io.EOF {
		return nil, io.EOF
	}
	if c.line == 0 && err == io.EOF && bytes.IndexByte(line, '\r') >= 0 {
		// One line holding the whole file: its lines end in carriage
		// returns alone.
		if err := utf8Error(line, c.name, 1); err != nil {
			return nil, err
		}
		return nil, &ParseError{File: c.name, Err: ErrCROnly}
	}
	c.line++
	n := len(line)
	switch {
	case n > 0 && line[n-1] == '\n':
		n--
		if n > 0 && line[n-1] == '\r' {
			n--
		}
	case n > 0 && line[n-1] == '\r':
		n--
	}
	return line[:n], nil
}

// next returns the next non-blank record's trimmed fields and the line it
// starts on; io.EOF after the last. Errors are *ParseError.
func (c *csvStream) next() ([][]byte, int, error) {
	if c.err != nil {
		return nil, 0, c.err
	}
	for {
		if len(c.queue) > 0 {
			q := c.queue[0]
			c.queue = c.queue[1:]
			c.started = true
			c.quotedFields = q.quoted
			return q.fields, q.line, nil
		}
		line, err := c.readLine()
		if err == io.EOF {
			return nil, 0, io.EOF
		}
		if err != nil {
			var pe *ParseError
			if errors.As(err, &pe) {
				return nil, 0, err
			}
			return nil, 0, &ParseError{File: c.name, Err: err}
		}
		if bytes.IndexByte(line, '"') < 0 || line[0] == '#' {
			// A line with quotes is checked with its record (quoted).
			if err := utf8Error(line, c.name, c.line); err != nil {
				return nil, 0, err
			}
		}
		if c.line == 1 {
			if hint, err := separatorHint(line, c.name); err != nil {
				return nil, 0, err
			} else if hint {
				continue
			}
		}
		if len(line) == 0 || line[0] == '#' {
			if !c.started && len(line) > 0 {
				c.meta = addMetaLine(c.meta, string(bytes.TrimSpace(line)))
			}
			continue
		}
		if bytes.IndexByte(line, '"') >= 0 {
			if err := c.quoted(line); err != nil {
				return nil, 0, err
			}
			continue
		}
		c.fields = c.fields[:0]
		blankRec := true
		for {
			i := bytes.IndexByte(line, ',')
			f := line
			if i >= 0 {
				f = line[:i]
			}
			f = bytes.TrimSpace(f)
			blankRec = blankRec && len(f) == 0
			c.fields = append(c.fields, f)
			if i < 0 {
				break
			}
			line = line[i+1:]
		}
		if !blankRec {
			c.started = true
			c.quotedFields = nil
			return c.fields, c.line, nil
		}
	}
}

// fieldQuoted reports that field i of the record next returned last was
// quoted.
func (c *csvStream) fieldQuoted(i int) bool {
	return i >= 0 && i < len(c.quotedFields) && c.quotedFields[i]
}

// quoted gathers the lines of a record holding quotes (a quoted field may
// span lines) until its quotes balance, and parses them with encoding/csv
// into the queue.
func (c *csvStream) quoted(first []byte) error {
	start := c.line
	chunk := append([]byte(nil), first...)
	quotes := bytes.Count(first, []byte{'"'})
	for quotes%2 != 0 {
		line, err := c.readLine()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *ParseError
			if errors.As(err, &pe) {
				return err
			}
			return &ParseError{File: c.name, Err: err}
		}
		chunk = append(append(chunk, '\n'), line...)
		quotes += bytes.Count(line, []byte{'"'})
		if len(chunk) > MaxLineBytes {
			return longLineError(c.name, start)
		}
	}
	if err := utf8Error(chunk, c.name, start); err != nil {
		return err
	}
	cr := csv.NewReader(bytes.NewReader(chunk))
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	finder := quoteFinder{data: chunk, line: 1}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return csvSyntaxError(c.name, chunk, start, c.header, pe)
			}
			return &ParseError{File: c.name, Row: start, Err: err}
		}
		line, _ := cr.FieldPos(0)
		q := queued{line: start + line - 1, quoted: finder.fields(cr, len(rec))}
		blankRec := true
		for _, f := range rec {
			b := bytes.TrimSpace([]byte(f))
			blankRec = blankRec && len(b) == 0
			q.fields = append(q.fields, b)
		}
		if !blankRec {
			c.queue = append(c.queue, q)
		}
	}
}

// pow10 holds the powers of ten a float64 holds exactly.
var pow10 = [...]float64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// parseDecimal reads a number cell as ParseNumber does. Plain decimals
// ([+-]digits[.digits], at most 15 significant digits) are converted
// directly: the digits as an integer below 2⁵³ divided by an exact power of
// ten is correctly rounded (Clinger, 1990, How to read floating point
// numbers accurately, the fast path). Anything else goes to ParseNumber.
func parseDecimal(b []byte) (float64, error) {
	i, n := 0, len(b)
	neg := false
	if n > 0 && (b[0] == '-' || b[0] == '+') {
		neg, i = b[0] == '-', 1
	}
	var m uint64
	digitsSeen, frac := 0, 0
	dot, seen := false, false
	for ; i < n; i++ {
		c := b[i]
		switch {
		case c >= '0' && c <= '9':
			if digitsSeen == 15 {
				return ParseNumber(string(b))
			}
			m = 10*m + uint64(c-'0')
			seen = true
			if m > 0 || dot {
				digitsSeen++
			}
			if dot {
				frac++
			}
		case c == '.' && !dot:
			dot = true
		default:
			return ParseNumber(string(b))
		}
	}
	if !seen {
		return ParseNumber(string(b))
	}
	v := float64(m) / pow10[frac]
	if neg {
		v = -v
	}
	return v, nil
}
