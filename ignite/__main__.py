from ignite.cli import main

main()
