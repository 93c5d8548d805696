#!/usr/bin/python3
"""Writes hostile workbooks by hand with Python's zipfile (no spreadsheet program involved):
  bomb.xlsx            a valid workbook whose sheet part inflates from about 70 KB to 64 MiB
                       of blanks (a compression ratio near 1000): refused as a zip bomb before
                       it is inflated;
  huge_dimension.xlsx  a sheet declaring A1:XFD1048576 with a value in its last cell and a
                       header only in A1: refused (a value with no header), in bounded memory.
"""
import pathlib
import zipfile

HERE = pathlib.Path(__file__).parent
CT = ('<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
      '<Default Extension="xml" ContentType="application/xml"/></Types>')
WB = ('<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" '
      'xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets>'
      '<sheet name="data" sheetId="1" r:id="rId1"/></sheets></workbook>')
RELS = ('<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">'
        '<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" '
        'Target="worksheets/sheet1.xml"/></Relationships>')
HEAD = '<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">'


def write(name, sheet_xml):
    with zipfile.ZipFile(HERE / name, "w", zipfile.ZIP_DEFLATED, compresslevel=9) as z:
        z.writestr("[Content_Types].xml", CT)
        z.writestr("xl/workbook.xml", WB)
        z.writestr("xl/_rels/workbook.xml.rels", RELS)
        z.writestr("xl/worksheets/sheet1.xml", sheet_xml)


def main():
    blanks = " " * (64 << 20)
    write("bomb.xlsx", HEAD + '<sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>a</t></is></c></row>' + blanks +
          "</sheetData></worksheet>")
    write("huge_dimension.xlsx", HEAD + '<dimension ref="A1:XFD1048576"/><sheetData>'
          '<row r="1"><c r="A1" t="inlineStr"><is><t>a</t></is></c></row>'
          '<row r="1048576"><c r="XFD1048576"><v>1</v></c></row></sheetData></worksheet>')


if __name__ == "__main__":
    main()
