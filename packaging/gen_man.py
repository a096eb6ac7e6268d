#!/usr/bin/env python3
"""Writes the lode(1) manual page from the program's own help text.

Usage: gen_man.py LODE_BINARY VERSION OUT.1.gz

Every subcommand's --help goes into COMMANDS as it prints, so the page never
drifts from the options; the fixed sections (files, environment, exit codes,
privacy) are written here once. The gzip carries no timestamp, so the
package is the same from one build to the next.
"""
import gzip
import os
import subprocess
import sys
import tempfile

lode, version, out = sys.argv[1], sys.argv[2], sys.argv[3]
# The builder's own config file must not change the page: empty XDG folders.
sandbox = tempfile.TemporaryDirectory()
env = dict(os.environ, XDG_CONFIG_HOME=sandbox.name, XDG_DATA_HOME=sandbox.name, HOME=sandbox.name)


def help_of(*args):
    return subprocess.run([lode, *args, "--help"], check=True, capture_output=True, text=True, env=env).stdout


def escape(text):
    # roff: a backslash is an escape, a line starting with . or ' a request.
    lines = []
    for line in text.replace("\\", "\\e").splitlines():
        lines.append("\\&" + line if line.startswith((".", "'")) else line)
    return "\n".join(lines)


def subcommands(top_help):
    names, in_list = [], False
    for line in top_help.splitlines():
        if line.strip().upper().startswith("SUBCOMMANDS"):
            in_list = True
            continue
        if in_list:
            if not line.strip():
                break
            names.append(line.split()[0])
    return names


top = help_of()
page = [
    '.TH LODE 1 "" "lode %s" "User Commands"' % version,
    ".SH NAME",
    "lode \\- local full-text search with ranked, explainable results",
    ".SH SYNOPSIS",
    ".B lode",
    "[\\fB\\-\\-index\\fR \\fIFILE\\fR] \\fICOMMAND\\fR [\\fIOPTIONS\\fR] [\\fIARGUMENTS\\fR]",
    ".SH DESCRIPTION",
    "lode builds an inverted index of a folder of documents (text, Markdown, JSON Lines, PDF, HTML,",
    "office files, e-mail) in one SQLite file, ranks with BM25 or TF-IDF cosine and shows each score",
    "term by term, from the shell (text or JSON), over a read-only HTTP API and a browser page.",
    "It evaluates rankings against judged queries and exports the TF-IDF matrix.",
    ".SH OPTIONS",
    ".nf",
    escape(top),
    ".fi",
    ".SH COMMANDS",
]
for name in subcommands(top):
    page += [".SS lode %s" % name, ".nf", escape(help_of(name)), ".fi"]
page += [
    ".SH QUERIES",
    "Bare words are ranked; \\fB\"a phrase\"\\fR must occur; \\fB+word\\fR is required, \\fB\\-word\\fR excluded;",
    "\\fBtitle:\\fR and \\fBbody:\\fR restrict to a field; \\fB@kind:\\fR, \\fB@in:\\fR, \\fB@since:\\fR, \\fB@until:\\fR,",
    "\\fB@by:\\fR and \\fB@pages:\\fR filter on metadata. A query may begin with \\fB\\-\\fR.",
    "Questionable queries (an unbalanced quote, an unknown field or filter, only excluded words) get a warning.",
    ".SH FILES",
    ".TP",
    ".I $XDG_DATA_HOME/lode/index.sqlite",
    "the default index (\\fB~/.local/share/lode/index.sqlite\\fR when XDG_DATA_HOME is unset).",
    ".TP",
    ".I $XDG_CONFIG_HOME/lode/config",
    "optional defaults, one \\fIkey\\fR = \\fIvalue\\fR a line: index, model, title_weight, body_weight,",
    "serve.address, serve.port, serve.token_file (\\fB~/.config/lode/config\\fR when XDG_CONFIG_HOME is unset).",
    "Precedence: option > environment > config file > default.",
    ".TP",
    ".I /usr/lib/systemd/system/lode.service",
    "runs \\fBlode serve\\fR as the \\fBlode\\fR user on 127.0.0.1:7340 with the index",
    "\\fI/var/lib/lode/index.sqlite\\fR and the config \\fI/etc/lode/config\\fR.",
    ".SH ENVIRONMENT",
    ".TP",
    ".B LODE_INDEX",
    "the index file when \\fB\\-\\-index\\fR is not given.",
    ".TP",
    ".B LODE_SERVE_TOKEN",
    "the token \\fBlode serve\\fR requires when \\fB\\-\\-token\\-file\\fR is not given.",
    ".TP",
    ".B XDG_DATA_HOME\\fR, \\fBXDG_CONFIG_HOME",
    "where the default index and the config file live.",
    ".TP",
    ".B NO_COLOR",
    "when set and not empty, no bold or colour on a terminal.",
    ".SH EXIT STATUS",
    "0 success; 1 failure; 2 bad command line, option value, query or config file;",
    "3 \\fBindex\\fR finished but some files could not be read (binary and media files are skipped, not failures).",
    ".SH PRIVACY",
    "\\fBlode serve\\fR listens on the loopback address unless \\fB\\-\\-address\\fR says otherwise;",
    "any other address exposes the text of the archive to whoever can reach the port.",
    ".SH SEE ALSO",
    "The README and docs/ in /usr/share/doc/lode/.",
]
with open(out, "wb") as f:
    with gzip.GzipFile(filename="", mode="wb", fileobj=f, mtime=0) as gz:
        gz.write(("\n".join(page) + "\n").encode("utf-8"))
