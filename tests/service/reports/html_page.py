"""A small tree of an HTML page for the HTML report's tests (stdlib html.parser only)."""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass, field
from html.parser import HTMLParser

VOID = {"area", "base", "br", "col", "embed", "hr", "img", "input", "link", "meta", "source",
        "track", "wbr"}


@dataclass
class Node:
    tag: str
    attrs: dict[str, str]
    children: list[Node] = field(default_factory=list)
    texts: list[str] = field(default_factory=list)

    def iter(self, tag: str | None = None) -> Iterator[Node]:
        if tag is None or self.tag == tag:
            yield self
        for child in self.children:
            yield from child.iter(tag)

    def find_all(self, tag: str | None = None, **attrs: str) -> list[Node]:
        want = {k.rstrip("_").replace("_", "-"): v for k, v in attrs.items()}
        return [n for n in self.iter(tag)
                if all(n.attrs.get(k) == v for k, v in want.items())]

    def text(self) -> str:
        return "".join(self.texts) + "".join(c.text() for c in self.children)

    def classes(self) -> set[str]:
        return set(self.attrs.get("class", "").split())


class _Builder(HTMLParser):
    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.root = Node("#root", {})
        self.stack = [self.root]

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        node = Node(tag, {k: v or "" for k, v in attrs})
        self.stack[-1].children.append(node)
        if tag not in VOID:
            self.stack.append(node)

    def handle_startendtag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.stack[-1].children.append(Node(tag, {k: v or "" for k, v in attrs}))

    def handle_endtag(self, tag: str) -> None:
        for i in range(len(self.stack) - 1, 0, -1):
            if self.stack[i].tag == tag:
                del self.stack[i:]
                return

    def handle_data(self, data: str) -> None:
        # text goes to the innermost open element, after its earlier children
        holder = Node("#text", {}, texts=[data])
        self.stack[-1].children.append(holder)


def parse(text: str) -> Node:
    builder = _Builder()
    builder.feed(text)
    builder.close()
    return builder.root


def table_rows(table: Node) -> list[list[str]]:
    """The text of each cell (th or td), row by row."""
    return [[" ".join(c.text().split()) for c in tr.children if c.tag in ("th", "td")]
            for tr in table.iter("tr")]
