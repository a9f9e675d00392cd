package report

import (
	"encoding/json"
	"io"
)

// EncodeJSON writes a document (study.Document, or a what-if document)
// indented, with a final newline. The documents' shapes are the study's own
// types: their tags are OUTPUT.md's contract.
func EncodeJSON(w io.Writer, doc any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
