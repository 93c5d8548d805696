# Warnings are set per target, never globally, so third-party headers stay out of it.
function(foldline_set_warnings target)
  target_compile_options(${target} PRIVATE -Wall -Wextra -Wpedantic)
endfunction()
