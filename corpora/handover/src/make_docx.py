#!/usr/bin/env python3
"""Build the demo Word file t07 from its plain-text source.

Usage: python3 make_docx.py [SOURCE] [OUTPUT]

The source has one paragraph per speaker turn ("Interviewer: ..." /
"Dorota: ..."), separated by blank lines. The output is a minimal but
valid .docx written with the standard library only: one <w:p> per
paragraph, text XML-escaped.
"""
import os
import sys
import zipfile
from xml.sax.saxutils import escape

HERE = os.path.dirname(os.path.abspath(__file__))
DEFAULT_SRC = os.path.join(HERE, "t07.txt")
DEFAULT_OUT = os.path.join(HERE, os.pardir, "t07-larch-ward-manager.docx")

CONTENT_TYPES = """<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">
  <Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>
  <Default Extension="xml" ContentType="application/xml"/>
  <Override PartName="/word/document.xml" ContentType="application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml"/>
</Types>
"""

RELS = """<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">
  <Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="word/document.xml"/>
</Relationships>
"""

DOC_HEAD = ('<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
            '<w:document xmlns:w="http://schemas.openxmlformats.org/wordprocessingml/2006/main">'
            '<w:body>')
DOC_TAIL = '</w:body></w:document>\n'


def paragraphs(text):
    """Split on blank lines; join wrapped lines of one paragraph with spaces."""
    blocks = [b for b in text.replace("\r\n", "\n").split("\n\n")]
    return [" ".join(b.split()) for b in blocks if b.strip()]


def document_xml(paras):
    body = "".join(
        '<w:p><w:r><w:t xml:space="preserve">%s</w:t></w:r></w:p>' % escape(p)
        for p in paras
    )
    return DOC_HEAD + body + DOC_TAIL


def main(argv):
    src = argv[1] if len(argv) > 1 else DEFAULT_SRC
    out = argv[2] if len(argv) > 2 else DEFAULT_OUT
    with open(src, encoding="utf-8") as f:
        paras = paragraphs(f.read())
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as z:
        z.writestr("[Content_Types].xml", CONTENT_TYPES)
        z.writestr("_rels/.rels", RELS)
        z.writestr("word/document.xml", document_xml(paras))
    print("wrote %s (%d paragraphs)" % (os.path.normpath(out), len(paras)))


if __name__ == "__main__":
    main(sys.argv)
