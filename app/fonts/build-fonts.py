"""Subset IBM Plex TTFs to the glyphs Benchclear shows, map Greek omega/mu onto the ohm/micro glyphs
where a font lacks them, and rename the family (OFL: a modified version must not keep the Reserved
Font Name "Plex")."""
import sys
from fontTools.ttLib import TTFont
from fontTools import subset

UNICODES = ("U+0000-00FF,U+0100-017F,U+0131,U+0152-0153,U+02BB-02BC,U+02C6,U+02DA,U+02DC,U+0304,"
            "U+0308,U+0329,U+0391-03A9,U+03B1-03C9,U+2000-206F,U+2070-209F,U+20AC,U+2113,U+2122,"
            "U+2126,U+2190-2199,U+2202,U+2206,U+2212,U+2215,U+2219,U+221A,U+221E,U+2248,U+2260,"
            "U+2264-2265,U+22C5,U+25B2-25C2,U+FEFF,U+FFFD")
FEATURES = ["kern", "liga", "calt", "tnum", "pnum", "lnum", "case", "zero", "ss01", "ss02",
            "ss03", "sups", "subs", "frac", "ccmp", "locl", "mark", "mkmk"]

def patch(font):
    for t in font["cmap"].tables:
        if not t.isUnicode():
            continue
        if 0x3A9 not in t.cmap and 0x2126 in t.cmap:
            t.cmap[0x3A9] = t.cmap[0x2126]
        if 0x3BC not in t.cmap and 0xB5 in t.cmap:
            t.cmap[0x3BC] = t.cmap[0xB5]
    for rec in font["name"].names:
        if rec.nameID in (1, 3, 4, 6, 16, 17, 21):
            s = rec.toUnicode().replace("IBM Plex", "Benchclear").replace("IBMPlex", "Benchclear")
            rec.string = s

def web(src, dst):
    opts = subset.Options()
    opts.layout_features = FEATURES
    opts.flavor = "woff2"
    font = subset.load_font(src, opts)
    sub = subset.Subsetter(opts)
    sub.populate(unicodes=subset.parse_unicodes(UNICODES))
    sub.subset(font)
    patch(font)
    subset.save_font(font, dst, opts)

def pdf(src, dst):
    font = TTFont(src)
    patch(font)
    font.save(dst)

if __name__ == "__main__":
    kind, src, dst = sys.argv[1:4]
    (web if kind == "web" else pdf)(src, dst)
