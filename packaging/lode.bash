# bash completion for lode: commands, then the options each command's own
# --help lists (so completion follows the program, never a copy of it).
_lode() {
  local cur prev cmd word i
  cur=${COMP_WORDS[COMP_CWORD]}
  prev=${COMP_WORDS[COMP_CWORD-1]}
  cmd=""
  for ((i = 1; i < COMP_CWORD; i++)); do
    word=${COMP_WORDS[i]}
    if [[ $word == --index ]]; then ((i++)); continue; fi
    if [[ $word != -* ]]; then cmd=$word; break; fi
  done
  case $prev in
    --index|--out|--batch|--queries|--judgments|--run|--save-run|--svg|--token-file)
      COMPREPLY=($(compgen -f -- "$cur")); return;;
    --model) COMPREPLY=($(compgen -W "bm25 tfidf" -- "$cur")); return;;
  esac
  if [[ -z $cmd ]]; then
    if [[ $cur == -* ]]; then
      COMPREPLY=($(compgen -W "--index --help --version" -- "$cur"))
    else
      local cmds
      cmds=$(lode --help 2>/dev/null | awk '/^Subcommands:/ {on = 1; next} on && NF {print $1}')
      COMPREPLY=($(compgen -W "$cmds" -- "$cur"))
    fi
    return
  fi
  if [[ $cur == -* ]]; then
    local opts
    opts=$(lode "$cmd" --help 2>/dev/null | grep -oE -- '(^|[ ,])--?[a-zA-Z][a-zA-Z0-9-]*' | tr -d ' ,' | sort -u)
    COMPREPLY=($(compgen -W "$opts" -- "$cur"))
  else
    COMPREPLY=($(compgen -f -- "$cur"))
  fi
}
complete -o filenames -F _lode lode
