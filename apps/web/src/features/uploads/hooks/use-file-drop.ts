import { useRef, useState, type DragEvent } from 'react';

/**
 * Drag-and-drop of one file onto an area. `isDragging` is true while a file is held over it. Nested
 * elements fire enter/leave pairs of their own, so a counter tells when the pointer really left.
 */
export function useFileDrop(onFile: (file: File) => void) {
  const [isDragging, setIsDragging] = useState(false);
  const depth = useRef(0);

  const carriesFiles = (event: DragEvent) => Array.from(event.dataTransfer?.types ?? []).includes('Files');

  return {
    isDragging,
    dropProps: {
      onDragEnter: (event: DragEvent) => {
        if (!carriesFiles(event)) return;
        event.preventDefault();
        depth.current += 1;
        setIsDragging(true);
      },
      onDragOver: (event: DragEvent) => {
        if (!carriesFiles(event)) return;
        event.preventDefault(); // allows the drop
        event.dataTransfer.dropEffect = 'copy';
      },
      onDragLeave: () => {
        depth.current = Math.max(0, depth.current - 1);
        if (depth.current === 0) setIsDragging(false);
      },
      onDrop: (event: DragEvent) => {
        event.preventDefault();
        depth.current = 0;
        setIsDragging(false);
        const file = event.dataTransfer?.files?.[0];
        if (file) onFile(file);
      },
    },
  };
}
