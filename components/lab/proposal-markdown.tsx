import ReactMarkdown from "react-markdown";
import remarkGfm from "remark-gfm";

/**
 * A proposer's markdown, rendered on the server: GitHub tables and lists, no raw HTML (skipped,
 * not escaped into view), and links that open without handing the lab's page to the target.
 */
export function ProposalMarkdown({ markdown }: { markdown: string }) {
  if (!markdown.trim()) return <p className="text-muted">No description.</p>;
  return (
    <div className="prose-lab text-sm leading-relaxed">
      <ReactMarkdown
        remarkPlugins={[remarkGfm]}
        skipHtml
        components={{
          a: ({ href, children }) => (
            <a href={href} rel="nofollow noopener noreferrer" target="_blank">
              {children}
            </a>
          ),
          img: ({ alt }) => <span className="text-muted">[image: {alt || "no description"}]</span>,
        }}
      >
        {markdown}
      </ReactMarkdown>
    </div>
  );
}
