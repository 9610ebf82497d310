/**
 * A text source read from a chosen file or pasted by hand: both fill one text the caller holds,
 * so a file read lands in the box where it can be checked or mended before it is sent.
 */
export function FileOrPaste(p: {
  /** `name` of the file input. */
  fileName: string;
  /** `name` of the textarea. */
  textName: string;
  accept: string;
  rows: number;
  text: string;
  onText: (text: string) => void;
  hint?: string;
}) {
  const readFile = async (f: File | undefined) => f && p.onText(await f.text());
  return (
    <>
      <label class="field">
        <span>file</span>
        <input
          type="file"
          name={p.fileName}
          accept={p.accept}
          onChange={(e) => readFile(e.currentTarget.files?.[0])}
        />
      </label>
      <label class="field wide">
        <span>or paste its text</span>
        <textarea
          name={p.textName}
          rows={p.rows}
          value={p.text}
          onInput={(e) => p.onText(e.currentTarget.value)}
        />
        {p.hint && <span class="muted hint">{p.hint}</span>}
      </label>
    </>
  );
}
