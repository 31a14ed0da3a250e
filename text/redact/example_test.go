package redact_test

import (
	"fmt"
	"os"

	"undercurrent/text/redact"
)

func Example() {
	r, err := redact.New(redact.Options{
		Names: []string{"Tobin Marsh"},
		Allow: []string{"Quosby Hardware"},
	})
	if err != nil {
		panic(err)
	}
	text := "Caller John Quillane reported a theft at Quosby Hardware, 123 Elm St. " +
		"Quillane gave phone (555) 555-0142. Tobin Marsh, DOB 01/02/1990, was seen leaving."
	out, spans := r.Redact(text)
	fmt.Println(out)
	var c redact.Counts
	c.Add(spans)
	fmt.Println(c.String())

	// The review file shows the original text: it must be named private.
	w := redact.NewReviewWriter(os.Stdout)
	w.Write("1", text, spans[:1])
	w.Flush()
	// Output:
	// Caller [NAME-1] reported a theft at Quosby Hardware, [ADDRESS] [NAME-1] gave phone [PHONE]. [NAME-2], DOB [DOB], was seen leaving.
	// name=3 phone=1 dob=1 address=1
	// record,type,start,end,placeholder,before,text,after
	// 1,name,7,20,[NAME-1],Caller ,John Quillane," reported a theft at Quosby Hardware, 12"
}
