// Draws pin and reply text from the markdown-lite token tree: text nodes (React escapes them) and a few
// fixed elements. No HTML string ever reaches the DOM.
import { Fragment } from "react";
import { renderPinText, type Inline } from "@/lib/pins/text";

function InlineNode({ node }: { node: Inline }) {
  switch (node.kind) {
    case "text":
      return <>{node.text}</>;
    case "bold":
      return (
        <strong>
          {node.children.map((child, index) => (
            <InlineNode key={index} node={child} />
          ))}
        </strong>
      );
    case "code":
      return <code className="rounded bg-slate-100 px-1 font-mono text-[0.85em] dark:bg-slate-800">{node.text}</code>;
    case "link":
      return (
        <a href={node.href} target="_blank" rel="noopener noreferrer nofollow" className="text-slip-700 underline hover:text-slip-900 dark:text-slip-300">
          {node.text}
        </a>
      );
    case "mention":
      return <span className="rounded bg-slip-50 px-0.5 font-medium text-slip-800 dark:bg-slip-950 dark:text-slip-200">{node.text}</span>;
  }
}

export function PinText({ text }: { text: string }) {
  const lines = renderPinText(text);
  return (
    <div className="whitespace-pre-wrap break-words text-sm leading-relaxed" data-testid="pin-text">
      {lines.map((line, lineIndex) => (
        <Fragment key={lineIndex}>
          {lineIndex > 0 && <br />}
          {line.map((node, index) => (
            <InlineNode key={index} node={node} />
          ))}
        </Fragment>
      ))}
    </div>
  );
}
