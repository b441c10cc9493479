// Reads report outputs from the outside with Debian's Python: SVG parsed by xml.etree (so it
// must be well-formed XML), PNG decoded by PIL (python3-pil, a dependency of python3-skimage),
// HTML checked for balanced tags by html.parser with every inline SVG parsed as XML.
#pragma once

#include <gtest/gtest.h>

#include <cstdlib>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>

#include "support/run_cli.hpp"

namespace tidewright::testing {

inline constexpr const char* report_probe_script = R"py(
import sys, json, base64, io, re
import xml.etree.ElementTree as ET
from html.parser import HTMLParser
try:
    from PIL import Image
    import numpy as np
except ImportError as e:
    sys.exit("missing Python package (Debian python3-pil / python3-numpy): %s" % e)

NS = '{http://www.w3.org/2000/svg}'

def svg_summary(root):
    out = {"classes": {}, "texts": [], "images": [], "marker_cx": [], "marker_cy": []}
    for el in root.iter():
        tag = el.tag.replace(NS, '')
        cls = el.get('class')
        if cls:
            out["classes"][cls] = out["classes"].get(cls, 0) + 1
        if tag == 'text':
            out["texts"].append(''.join(el.itertext()))
        if tag == 'image':
            href = el.get('href')
            if not href.startswith('data:image/png;base64,'):
                out.setdefault("bad_images", []).append(href[:40])
                continue
            im = Image.open(io.BytesIO(base64.b64decode(href.split(',', 1)[1])))
            out["images"].append([im.width, im.height] +
                                 [float(el.get(k)) for k in ('x', 'y', 'width', 'height')])
        if tag == 'clipPath':
            r = el[0]
            out["clip"] = [float(r.get(k)) for k in ('x', 'y', 'width', 'height')]
        if tag == 'circle' and cls == 'legend-marker':
            out["legend_marker_cx"] = float(el.get('cx'))
        if tag == 'circle' and cls == 'marker':
            out["marker_cx"].append(float(el.get('cx')))
            out["marker_cy"].append(float(el.get('cy')))
    return out

mode, path = sys.argv[1], sys.argv[2]
if mode == 'svg':
    print(json.dumps(svg_summary(ET.parse(path).getroot())))
elif mode == 'png':
    im = Image.open(path)
    a = np.asarray(im.convert('RGB'), dtype=float)
    out = {"format": im.format, "width": im.width, "height": im.height, "std": float(a.std())}
    if len(sys.argv) > 4:
        x, y = int(sys.argv[3]), int(sys.argv[4])
        out["pixel"] = [int(v) for v in a[y, x]]
    print(json.dumps(out))
elif mode == 'html':
    text = open(path, encoding='utf-8').read()
    void = {'meta', 'link', 'br', 'hr', 'img', 'input', 'col', 'source', 'wbr', 'area', 'base'}
    class Balanced(HTMLParser):
        def __init__(self):
            super().__init__(convert_charrefs=True)
            self.stack, self.errors, self.data = [], [], []
        def handle_starttag(self, tag, attrs):
            if tag not in void:
                self.stack.append(tag)
        def handle_startendtag(self, tag, attrs):
            pass
        def handle_endtag(self, tag):
            if not self.stack or self.stack[-1] != tag:
                self.errors.append("unexpected </%s> (open: %s)" % (tag, self.stack[-3:]))
            else:
                self.stack.pop()
        def handle_data(self, d):
            self.data.append(d)
    p = Balanced()
    p.feed(text)
    p.close()
    if p.stack:
        p.errors.append("unclosed: %s" % p.stack)
    svgs = []
    for s in re.findall(r'<svg\b.*?</svg>', text, re.S):
        root = ET.fromstring(s.replace('<svg', '<svg xmlns="http://www.w3.org/2000/svg"', 1))
        svgs.append(svg_summary(root))
    print(json.dumps({"errors": p.errors, "svgs": svgs, "text": ''.join(p.data)}))
)py";

// Runs the probe on `file` ("svg", "png" with optional pixel x y, or "html") and returns its
// JSON; a Python failure is a test failure with Python's message.
inline nlohmann::json probe_report_file(const std::string& mode, const std::filesystem::path& file,
                                        const std::string& extra_args = "") {
  TempDir tmp;
  const auto script = tmp / "probe.py";
  const auto out = tmp / "out.json";
  const auto err = tmp / "err.txt";
  {
    FILE* f = std::fopen(script.c_str(), "wb");
    std::fputs(report_probe_script, f);
    std::fclose(f);
  }
  const std::string cmd = std::string(TIDEWRIGHT_PYTHON) + " " + shell_quote(script.string()) +
                          " " + mode + " " + shell_quote(file.string()) + " " + extra_args + " >" +
                          shell_quote(out.string()) + " 2>" + shell_quote(err.string());
  const int status = std::system(cmd.c_str());
  if (status != 0) {
    ADD_FAILURE() << "probe of " << file << " failed: " << read_all(err);
    return nlohmann::json::object();
  }
  return nlohmann::json::parse(read_all(out));
}

inline void write_bytes(const std::filesystem::path& p, const std::string& bytes) {
  FILE* f = std::fopen(p.c_str(), "wb");
  ASSERT_NE(f, nullptr) << p;
  std::fwrite(bytes.data(), 1, bytes.size(), f);
  std::fclose(f);
}

}  // namespace tidewright::testing
